package main

import (
	"bufio"
	"bytes"
	"context"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// startServe runs serve on a free loopback port until the test ends and
// returns the address it prints.
func startServe(t *testing.T) string {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	pr, pw := io.Pipe()
	done := make(chan error, 1)
	var stderr bytes.Buffer
	go func() {
		err := serve(ctx, []string{"-port", "0"}, pw, &stderr)
		pw.CloseWithError(io.EOF)
		done <- err
	}()
	t.Cleanup(func() {
		cancel()
		select {
		case err := <-done:
			if err != nil {
				t.Errorf("serve: %v", err)
			}
		case <-time.After(10 * time.Second):
			t.Errorf("serve did not stop within 10 s of its context")
		}
	})
	urls := make(chan string, 1)
	go func() {
		sc := bufio.NewScanner(pr)
		for sc.Scan() {
			if i := strings.Index(sc.Text(), "http://"); i >= 0 {
				urls <- strings.TrimSuffix(strings.Fields(sc.Text()[i:])[0], "/")
			}
		}
		close(urls)
	}()
	select {
	case u, ok := <-urls:
		if !ok {
			t.Fatalf("serve stopped before printing its address; stderr:\n%s", stderr.String())
		}
		return u
	case <-time.After(10 * time.Minute):
		t.Fatalf("serve printed no address within 10 minutes (building the WebAssembly program); stderr:\n%s", stderr.String())
	}
	return ""
}

// The server answers the site's own files with their media types and
// nothing else: other paths (the source tree, directory listings) are not
// found and only GET and HEAD are allowed (RFC 9110 §15.5.6 for 405 and
// its Allow header). The WebAssembly program starts with the binary
// format's magic number and version (WebAssembly Core Specification
// §5.5.16: 0x00 0x61 0x73 0x6D, version 1).
func TestServe(t *testing.T) {
	base := startServe(t)
	get := func(method, path string) (*http.Response, []byte) {
		t.Helper()
		req, err := http.NewRequest(method, base+path, nil)
		if err != nil {
			t.Fatal(err)
		}
		resp, err := http.DefaultClient.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		defer resp.Body.Close()
		b, err := io.ReadAll(resp.Body)
		if err != nil {
			t.Fatal(err)
		}
		return resp, b
	}
	for _, c := range []struct {
		path, ctype, contains string
	}{
		{"/", "text/html", `src="wasm/frame.html"`},
		{"/index.html", "text/html", `data-control="scenario"`},
		{"/wasm/frame.html", "text/html", `eddyblock.wasm`},
		{"/wasm/wasm_exec.js", "javascript", "Go"},
		{"/wasm/eddyblock.wasm", "application/wasm", "\x00asm\x01\x00\x00\x00"},
	} {
		resp, b := get("GET", c.path)
		if resp.StatusCode != 200 {
			t.Errorf("GET %s: status %d", c.path, resp.StatusCode)
			continue
		}
		if ct := resp.Header.Get("Content-Type"); !strings.Contains(ct, c.ctype) {
			t.Errorf("GET %s: Content-Type %q, want %q", c.path, ct, c.ctype)
		}
		if !bytes.Contains(b[:min(len(b), 1<<16)], []byte(c.contains)) {
			t.Errorf("GET %s: body does not contain %q", c.path, c.contains)
		}
	}
	for _, p := range []string{"/go.mod", "/wasm/", "/wasm/main_js.go", "/../go.mod", "/cmd/eddyblock/web.go", "/index.html/"} {
		if resp, _ := get("GET", p); resp.StatusCode != 404 {
			t.Errorf("GET %s: status %d, want 404", p, resp.StatusCode)
		}
	}
	if resp, _ := get("POST", "/"); resp.StatusCode != 405 || resp.Header.Get("Allow") == "" {
		t.Errorf("POST /: status %d, Allow %q; want 405 with an Allow header", resp.StatusCode, resp.Header.Get("Allow"))
	}
	if !strings.HasPrefix(base, "http://127.0.0.1:") {
		t.Errorf("serve listens on %s, want the loopback address by default", base)
	}
}

// A port in use is reported at once, naming the port, before any build.
func TestServePortTaken(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	port := ln.Addr().(*net.TCPAddr).Port
	start := time.Now()
	var out, errb bytes.Buffer
	err = serve(context.Background(), []string{"-port", strconv.Itoa(port)}, &out, &errb)
	if err == nil || !strings.Contains(err.Error(), "already in use") || !strings.Contains(err.Error(), strconv.Itoa(port)) {
		t.Fatalf("serve on a taken port: error %v, want one saying port %d is already in use", err, port)
	}
	if strings.Contains(errb.String(), "building") {
		t.Errorf("serve started building before reporting the taken port")
	}
	t.Logf("refused in %v", time.Since(start))
	for _, args := range [][]string{{"-port", "70000"}, {"-addr", ""}, {"extra"}} {
		if err := serve(context.Background(), args, &out, &errb); err == nil {
			t.Errorf("serve %v: no error", args)
		}
	}
}

// site writes the four files of the static site; it replaces an earlier
// export as a whole, and refuses a directory that holds anything else,
// leaving it as it was.
func TestSite(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "site")
	var out, errb bytes.Buffer
	if err := cmdSite([]string{dir}, &out, &errb); err != nil {
		t.Fatalf("site: %v\n%s", err, errb.String())
	}
	for _, f := range siteFiles() {
		st, err := os.Stat(filepath.Join(dir, filepath.FromSlash(f)))
		if err != nil || st.Size() == 0 {
			t.Errorf("site: %s missing or empty (%v)", f, err)
		}
	}
	b, err := os.ReadFile(filepath.Join(dir, filepath.FromSlash(siteWasm)))
	if err != nil || !bytes.HasPrefix(b, []byte("\x00asm\x01\x00\x00\x00")) {
		t.Errorf("site: %s is not a WebAssembly binary (WebAssembly Core Specification §5.5.16 magic and version)", siteWasm)
	}
	// again into the earlier export: replaced
	if err := cmdSite([]string{dir}, &out, &errb); err != nil {
		t.Fatalf("site into an earlier export: %v", err)
	}
	// a directory with other files is refused and kept
	other := t.TempDir()
	keep := filepath.Join(other, "notes.txt")
	if err := os.WriteFile(keep, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	err = cmdSite([]string{other}, &out, &errb)
	if err == nil || !strings.Contains(err.Error(), "notes.txt") {
		t.Errorf("site into a directory with other files: error %v, want one naming notes.txt", err)
	}
	if b, err := os.ReadFile(keep); err != nil || string(b) != "mine" {
		t.Errorf("site changed a file it refused to replace")
	}
	if _, err := os.Stat(filepath.Join(other, siteIndex)); err == nil {
		t.Errorf("site wrote into a directory it refused")
	}
	file := filepath.Join(t.TempDir(), "f")
	if err := os.WriteFile(file, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{{}, {file}, {filepath.Join(t.TempDir(), "no", "such")}, {"a", "b"}} {
		if err := cmdSite(args, &out, &errb); err == nil {
			t.Errorf("site %v: no error", args)
		}
	}
}
