//go:build unix

package main

import (
	"bytes"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
)

// unprivileged is the user and group the built command runs as when the
// tests run as root ("nobody" on most systems; the id need not exist).
const unprivileged = 65534

// TestOutputFolderReadOnly checks the two refusals of an output folder
// that cannot be used, also when the tests run as root (as CI does), who
// ignores permission bits:
//
//   - a folder under a file, and a folder that cannot be created because a
//     broken link stands in its way (both fail for root too);
//   - a read-only folder: as an ordinary user in-process; as root the built
//     command is run as an unprivileged user, to whom the mode 0555 applies.
//
// Both must exit 1 with one line naming the folder and nothing written.
func TestOutputFolderReadOnly(t *testing.T) {
	dir := t.TempDir()
	blocker := filepath.Join(dir, "results")
	if err := os.WriteFile(blocker, []byte("not a folder"), 0o644); err != nil {
		t.Fatal(err)
	}
	want := filepath.Join(blocker, "sub")
	code, _, stderr := runCLI(t, "run", "--out", want)
	oneLine(t, code, stderr, 1, "cannot use output folder", want, "not a directory")
	if b, _ := os.ReadFile(blocker); string(b) != "not a folder" {
		t.Error("the file in the way changed")
	}
	// A broken link where the folder should go: the folder does not exist,
	// and it cannot be created because the link stands in its way.
	link := filepath.Join(dir, "link")
	if err := os.Symlink(filepath.Join(dir, "gone", "out"), link); err != nil {
		t.Fatal(err)
	}
	code, _, stderr = runCLI(t, "run", "--out", link)
	oneLine(t, code, stderr, 1, "cannot create output folder", link, "file exists")
	if _, err := os.Stat(filepath.Join(dir, "gone")); err == nil {
		t.Error("the link's target folder was created")
	}

	ro := filepath.Join(dir, "ro")
	if err := os.Mkdir(ro, 0o555); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(ro, 0o555); err != nil { // past the umask
		t.Fatal(err)
	}
	if os.Geteuid() != 0 {
		code, _, stderr = runCLI(t, "run", "--out", ro)
		oneLine(t, code, stderr, 1, "cannot write in output folder", ro)
		code, _, stderr = runCLI(t, "run", "--out", filepath.Join(ro, "sub"))
		oneLine(t, code, stderr, 1, "cannot create output folder", filepath.Join(ro, "sub"))
		emptyDir(t, ro)
		return
	}

	// Root: the built command, copied where the unprivileged user can run
	// it, inside folders it may enter.
	for d := dir; d != os.TempDir() && d != "/" && len(d) > len(os.TempDir()); d = filepath.Dir(d) {
		if err := os.Chmod(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	bin := filepath.Join(dir, "tempstack")
	data, err := os.ReadFile(builtCommand(t))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(bin, data, 0o755); err != nil {
		t.Fatal(err)
	}
	asUser := func(args ...string) (int, string) {
		cmd := exec.Command(bin, args...)
		cmd.Dir = dir
		cmd.Env = []string{"HOME=" + dir, "PATH=/usr/bin:/bin"}
		cmd.SysProcAttr = &syscall.SysProcAttr{Credential: &syscall.Credential{Uid: unprivileged, Gid: unprivileged}}
		var errb bytes.Buffer
		cmd.Stderr = &errb
		err := cmd.Run()
		var ee *exec.ExitError
		switch {
		case err == nil:
			return 0, errb.String()
		case errors.As(err, &ee):
			return ee.ExitCode(), errb.String()
		}
		t.Fatalf("running the command as user %d: %v", unprivileged, err)
		return 0, ""
	}
	t.Logf("running as root: the command runs as user %d", unprivileged)
	code, stderr = asUser("run", "--out", ro)
	oneLine(t, code, stderr, 1, "cannot write in output folder", ro, "permission denied")
	code, stderr = asUser("run", "--out", filepath.Join(ro, "sub"))
	oneLine(t, code, stderr, 1, "cannot create output folder", filepath.Join(ro, "sub"), "permission denied")
	emptyDir(t, ro)
}

func emptyDir(t *testing.T, dir string) {
	t.Helper()
	if entries, err := os.ReadDir(dir); err != nil || len(entries) != 0 {
		t.Errorf("read-only folder: %d entries (%v), want none", len(entries), err)
	}
}
