package browsertest

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"strings"
	"sync"
	"time"
)

// chromiumFlags are the flags chromium runs with: headless, no sandbox
// (CI runs as root), and every background service that would reach for
// the network switched off, so that the only requests left are the page's.
var chromiumFlags = []string{
	"--headless",
	"--no-sandbox",
	"--disable-gpu",
	"--disable-quic",
	"--no-first-run",
	"--no-default-browser-check",
	"--disable-background-networking",
	"--disable-component-update",
	"--disable-sync",
	"--disable-extensions",
	"--disable-default-apps",
	"--disable-dev-shm-usage",
	"--hide-scrollbars",
	"--mute-audio",
	"--remote-debugging-pipe",
}

// findChromium returns the path of the chromium binary, or "" when none is
// installed.
func findChromium() string {
	if p := os.Getenv("TEMPSTACK_CHROMIUM"); p != "" {
		return p
	}
	if _, err := os.Stat("/usr/bin/chromium"); err == nil {
		return "/usr/bin/chromium"
	}
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	return ""
}

// cdpMessage is one DevTools protocol message in either direction: a
// command (ID, Method, Params), its response (ID, Result or Error) or an
// event (Method, Params). SessionID addresses a page attached in flat mode.
type cdpMessage struct {
	ID        int64           `json:"id,omitempty"`
	Method    string          `json:"method,omitempty"`
	Params    json.RawMessage `json:"params,omitempty"`
	SessionID string          `json:"sessionId,omitempty"`
	Result    json.RawMessage `json:"result,omitempty"`
	Error     *cdpError       `json:"error,omitempty"`
}

type cdpError struct {
	Code    int    `json:"code"`
	Message string `json:"message"`
	Data    string `json:"data,omitempty"`
}

func (e *cdpError) Error() string {
	return fmt.Sprintf("cdp error %d: %s %s", e.Code, e.Message, e.Data)
}

// eventHandler receives the events of one session. It runs on the reader
// goroutine: it must not block and must not wait for a command's answer
// (it may post commands).
type eventHandler func(method string, params json.RawMessage)

// browser is a running chromium with a DevTools connection over pipes.
type browser struct {
	cmd     *exec.Cmd
	dataDir string
	stderr  *bytes.Buffer // chromium's own log, for diagnostics

	wmu sync.Mutex // serialises writes to the pipe
	w   io.WriteCloser

	mu       sync.Mutex
	nextID   int64
	pending  map[int64]chan cdpMessage
	handlers map[string]eventHandler // by session id
	readErr  error
	done     chan struct{} // closed when the reader stops
}

// launchBrowser starts chromium at path with a new empty profile in
// dataDir and connects to it.
func launchBrowser(path, dataDir string) (*browser, error) {
	// Pipe 1: we write commands, chromium reads them on fd 3.
	inR, inW, err := os.Pipe()
	if err != nil {
		return nil, err
	}
	// Pipe 2: chromium writes answers and events on fd 4, we read them.
	outR, outW, err := os.Pipe()
	if err != nil {
		inR.Close()
		inW.Close()
		return nil, err
	}
	args := append([]string{}, chromiumFlags...)
	args = append(args, "--user-data-dir="+dataDir, "about:blank")
	cmd := exec.Command(path, args...)
	cmd.ExtraFiles = []*os.File{inR, outW}
	stderr := &bytes.Buffer{}
	cmd.Stdout = io.Discard
	cmd.Stderr = &lockedWriter{w: stderr}
	if err := cmd.Start(); err != nil {
		inR.Close()
		inW.Close()
		outR.Close()
		outW.Close()
		return nil, fmt.Errorf("starting %s: %w", path, err)
	}
	inR.Close()
	outW.Close()
	b := &browser{
		cmd:      cmd,
		dataDir:  dataDir,
		stderr:   stderr,
		w:        inW,
		pending:  map[int64]chan cdpMessage{},
		handlers: map[string]eventHandler{},
		done:     make(chan struct{}),
	}
	go b.read(outR)
	// The first command proves the connection works.
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Second)
	defer cancel()
	var v struct {
		Product string `json:"product"`
	}
	if err := b.call(ctx, "", "Browser.getVersion", nil, &v); err != nil {
		b.close()
		return nil, fmt.Errorf("chromium did not answer on its DevTools pipe: %w\nchromium log:\n%s", err, b.log())
	}
	return b, nil
}

// lockedWriter lets the exec package and the test read the same buffer.
type lockedWriter struct {
	mu sync.Mutex
	w  *bytes.Buffer
}

func (l *lockedWriter) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.w.Write(p)
}

// log returns the tail of chromium's stderr.
func (b *browser) log() string {
	lw := b.cmd.Stderr.(*lockedWriter)
	lw.mu.Lock()
	defer lw.mu.Unlock()
	s := lw.w.String()
	if len(s) > 4000 {
		s = "…" + s[len(s)-4000:]
	}
	return s
}

// read delivers answers to their callers and events to their session's
// handler until the pipe closes.
func (b *browser) read(r io.ReadCloser) {
	defer close(b.done)
	defer r.Close()
	br := bufio.NewReaderSize(r, 1<<20)
	for {
		raw, err := br.ReadBytes(0)
		if err != nil {
			b.mu.Lock()
			b.readErr = err
			for id, ch := range b.pending {
				close(ch)
				delete(b.pending, id)
			}
			b.mu.Unlock()
			return
		}
		var m cdpMessage
		if err := json.Unmarshal(raw[:len(raw)-1], &m); err != nil {
			continue
		}
		b.mu.Lock()
		if m.ID != 0 {
			ch := b.pending[m.ID]
			delete(b.pending, m.ID)
			b.mu.Unlock()
			if ch != nil {
				ch <- m
			}
			continue
		}
		h := b.handlers[m.SessionID]
		b.mu.Unlock()
		if h != nil {
			h(m.Method, m.Params)
		}
	}
}

// send writes one command and returns the channel its answer arrives on
// (nil when wait is false: the answer is dropped).
func (b *browser) send(session, method string, params any, wait bool) (chan cdpMessage, error) {
	var p json.RawMessage
	if params != nil {
		var err error
		if p, err = json.Marshal(params); err != nil {
			return nil, err
		}
	}
	b.mu.Lock()
	if b.readErr != nil {
		b.mu.Unlock()
		return nil, fmt.Errorf("devtools pipe closed: %w", b.readErr)
	}
	b.nextID++
	id := b.nextID
	var ch chan cdpMessage
	if wait {
		ch = make(chan cdpMessage, 1)
		b.pending[id] = ch
	}
	b.mu.Unlock()
	data, err := json.Marshal(cdpMessage{ID: id, Method: method, Params: p, SessionID: session})
	if err != nil {
		return nil, err
	}
	b.wmu.Lock()
	_, err = b.w.Write(append(data, 0))
	b.wmu.Unlock()
	if err != nil {
		b.mu.Lock()
		delete(b.pending, id)
		b.mu.Unlock()
		return nil, fmt.Errorf("writing to devtools pipe: %w", err)
	}
	return ch, nil
}

// call runs one command and decodes its result into out (when not nil).
func (b *browser) call(ctx context.Context, session, method string, params, out any) error {
	ch, err := b.send(session, method, params, true)
	if err != nil {
		return err
	}
	select {
	case m, ok := <-ch:
		if !ok {
			return fmt.Errorf("%s: devtools pipe closed", method)
		}
		if m.Error != nil {
			return fmt.Errorf("%s: %w", method, m.Error)
		}
		if out != nil {
			return json.Unmarshal(m.Result, out)
		}
		return nil
	case <-ctx.Done():
		return fmt.Errorf("%s: %w", method, ctx.Err())
	}
}

// post sends a command without waiting for its answer; for event handlers.
func (b *browser) post(session, method string, params any) {
	_, _ = b.send(session, method, params, false)
}

// setHandler routes the events of session to h (nil removes it).
func (b *browser) setHandler(session string, h eventHandler) {
	b.mu.Lock()
	defer b.mu.Unlock()
	if h == nil {
		delete(b.handlers, session)
		return
	}
	b.handlers[session] = h
}

// close asks chromium to quit, kills it if it does not, and removes its
// profile.
func (b *browser) close() {
	ctx, cancel := context.WithTimeout(context.Background(), 3*time.Second)
	_ = b.call(ctx, "", "Browser.close", nil, nil)
	cancel()
	b.w.Close()
	exited := make(chan struct{})
	go func() { _ = b.cmd.Wait(); close(exited) }()
	select {
	case <-exited:
	case <-time.After(5 * time.Second):
		_ = b.cmd.Process.Kill()
		<-exited
	}
	// Chromium's helper processes may still hold the profile for a moment.
	for i := 0; i < 20; i++ {
		if err := os.RemoveAll(b.dataDir); err == nil || errors.Is(err, os.ErrNotExist) {
			break
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// shortJSON shortens a raw message for an error text.
func shortJSON(raw json.RawMessage) string {
	s := strings.TrimSpace(string(raw))
	if len(s) > 300 {
		s = s[:300] + "…"
	}
	return s
}
