module tempstack

go 1.26
