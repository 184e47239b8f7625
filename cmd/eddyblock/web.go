package main

import (
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// The browser demo's static site: the page at the top, the program's frame,
// Go's WebAssembly loader and the program, at these paths.
const (
	siteIndex  = "index.html"
	siteFrame  = "wasm/frame.html"
	siteLoader = "wasm/wasm_exec.js"
	siteWasm   = "wasm/eddyblock.wasm"
)

// siteFiles lists the site's files.
func siteFiles() []string { return []string{siteIndex, siteFrame, siteLoader, siteWasm} }

const webUsage = `usage:
  eddyblock serve [-port N] [-addr HOST] [-src DIR]
        build the browser demo with the local Go toolchain and serve it (default http://127.0.0.1:8080/)
  eddyblock site [-src DIR] DIR
        write the browser demo as a static folder any web server can host`

// webFlags are the options serve and site share.
type webFlags struct {
	src  string // the module's source tree
	port int
	addr string
}

func parseWebFlags(name string, args []string, stderr io.Writer, serve bool) (*webFlags, []string, error) {
	f := &webFlags{}
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.StringVar(&f.src, "src", "", "the eddyblock source tree (default: the Go module of the current directory)")
	if serve {
		fs.IntVar(&f.port, "port", 8080, "TCP port to listen on (0: any free port)")
		fs.StringVar(&f.addr, "addr", "127.0.0.1", "address to listen on; the default serves this machine only")
	}
	if err := fs.Parse(args); err != nil {
		return nil, nil, err
	}
	if serve {
		if f.port < 0 || f.port > 65535 {
			return nil, nil, fmt.Errorf("-port %d: must be from 0 to 65535", f.port)
		}
		if strings.TrimSpace(f.addr) == "" {
			return nil, nil, errors.New("-addr: empty address")
		}
	}
	return f, fs.Args(), nil
}

// cmdSite writes the static site into a directory: a new one, an empty one,
// or one that holds an earlier export (and nothing else), which is replaced
// as a whole once the new site is complete.
func cmdSite(args []string, stdout, stderr io.Writer) error {
	f, rest, err := parseWebFlags("site", args, stderr, false)
	if err != nil {
		return err
	}
	if len(rest) != 1 || strings.TrimSpace(rest[0]) == "" {
		return errors.New("site takes one directory\n" + webUsage)
	}
	dir := filepath.Clean(rest[0])
	if err := checkSiteDir(dir); err != nil {
		return err
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	src, err := sourceTree(ctx, f.src)
	if err != nil {
		return err
	}
	stage, err := os.MkdirTemp(filepath.Dir(dir), "."+filepath.Base(dir)+".new-")
	if err != nil {
		return fmt.Errorf("site: %w", err)
	}
	defer os.RemoveAll(stage)
	fmt.Fprintln(stderr, "eddyblock: building the WebAssembly program…")
	if err := buildSite(ctx, src, stage); err != nil {
		return err
	}
	if err := os.Chmod(stage, 0o755); err != nil {
		return fmt.Errorf("site: %w", err)
	}
	if err := replaceDir(stage, dir); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote the browser demo to %s (%s); open index.html through any web server\n", dir, strings.Join(siteFiles(), ", "))
	return nil
}

// checkSiteDir refuses a target that is a file or a directory holding
// anything but an earlier export, before any work starts.
func checkSiteDir(dir string) error {
	st, err := os.Stat(dir)
	switch {
	case errors.Is(err, os.ErrNotExist):
		parent := filepath.Dir(dir)
		if ps, err := os.Stat(parent); err != nil || !ps.IsDir() {
			return fmt.Errorf("site: the directory %s that should hold %s does not exist", parent, dir)
		}
		return nil
	case err != nil:
		return fmt.Errorf("site: %w", err)
	case !st.IsDir():
		return fmt.Errorf("site: %s exists and is not a directory", dir)
	}
	ours := map[string]bool{}
	for _, f := range siteFiles() {
		ours[filepath.FromSlash(f)] = true
	}
	return filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		if rel == "." || (d.IsDir() && rel == "wasm") || ours[rel] {
			return nil
		}
		return fmt.Errorf("site: %s holds %s, which is not part of the demo: choose a new or empty directory, or an earlier export", dir, rel)
	})
}

// replaceDir moves the finished site stage to dir, replacing an earlier
// export only after the new one is complete.
func replaceDir(stage, dir string) error {
	if _, err := os.Stat(dir); errors.Is(err, os.ErrNotExist) {
		return os.Rename(stage, dir)
	}
	old := stage + ".old"
	if err := os.Rename(dir, old); err != nil {
		return fmt.Errorf("site: %w", err)
	}
	if err := os.Rename(stage, dir); err != nil {
		if err2 := os.Rename(old, dir); err2 != nil {
			return fmt.Errorf("site: %w (and the earlier export is left at %s: %v)", err, old, err2)
		}
		return fmt.Errorf("site: %w", err)
	}
	return os.RemoveAll(old)
}

// sourceTree returns the eddyblock module's root: dir if given, else the
// module of the current directory. It must hold the page and the program.
func sourceTree(ctx context.Context, dir string) (string, error) {
	if dir == "" {
		out, err := goCommand(ctx, "", nil, "env", "GOMOD")
		if err != nil {
			return "", err
		}
		mod := strings.TrimSpace(out)
		if mod == "" || mod == os.DevNull {
			return "", errors.New("the current directory is not in the eddyblock source tree: run this from it, or give -src DIR")
		}
		dir = filepath.Dir(mod)
	}
	for _, f := range []string{"go.mod", siteIndex, siteFrame, "wasm/main_js.go"} {
		if _, err := os.Stat(filepath.Join(dir, filepath.FromSlash(f))); err != nil {
			return "", fmt.Errorf("%s is not the eddyblock source tree: %s is missing", dir, f)
		}
	}
	return dir, nil
}

// buildSite writes the site into dst: the page and the frame from the source
// tree src, Go's loader from the toolchain and the program built with it.
func buildSite(ctx context.Context, src, dst string) error {
	if err := os.MkdirAll(filepath.Join(dst, "wasm"), 0o755); err != nil {
		return fmt.Errorf("site: %w", err)
	}
	goroot, err := goCommand(ctx, src, nil, "env", "GOROOT")
	if err != nil {
		return err
	}
	goroot = strings.TrimSpace(goroot)
	loader := filepath.Join(goroot, "lib", "wasm", "wasm_exec.js")
	if _, err := os.Stat(loader); err != nil {
		loader = filepath.Join(goroot, "misc", "wasm", "wasm_exec.js") // before Go 1.24
	}
	for from, to := range map[string]string{
		filepath.Join(src, siteIndex):                     siteIndex,
		filepath.Join(src, filepath.FromSlash(siteFrame)): siteFrame,
		loader: siteLoader,
	} {
		if err := copyFile(from, filepath.Join(dst, filepath.FromSlash(to))); err != nil {
			return fmt.Errorf("site: %w", err)
		}
	}
	out := filepath.Join(dst, filepath.FromSlash(siteWasm))
	if _, err := goCommand(ctx, src, []string{"GOOS=js", "GOARCH=wasm"}, "build", "-trimpath", "-ldflags=-s -w", "-o", out, "./wasm"); err != nil {
		return err
	}
	return nil
}

// goCommand runs the local go command in dir with extra environment
// variables and returns its standard output; an error carries its
// standard error.
func goCommand(ctx context.Context, dir string, env []string, args ...string) (string, error) {
	goBin, err := exec.LookPath("go")
	if err != nil {
		return "", errors.New("the Go toolchain (the go command) is not on PATH; it builds the WebAssembly program")
	}
	cmd := exec.CommandContext(ctx, goBin, args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), env...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Run(); err != nil {
		return "", fmt.Errorf("go %s: %v\n%s", strings.Join(args, " "), err, strings.TrimSpace(errb.String()))
	}
	return out.String(), nil
}

func copyFile(from, to string) error {
	b, err := os.ReadFile(from)
	if err != nil {
		return err
	}
	return os.WriteFile(to, b, 0o644)
}

// cmdServe builds the site into a temporary directory and serves it until
// interrupted.
func cmdServe(args []string, stdout, stderr io.Writer) error {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	return serve(ctx, args, stdout, stderr)
}

// serve is cmdServe until ctx is done. It listens before it builds, so that
// a port in use is reported at once.
func serve(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	f, rest, err := parseWebFlags("serve", args, stderr, true)
	if err != nil {
		return err
	}
	if len(rest) > 0 {
		return fmt.Errorf("serve: unexpected argument %q (options come as -name value)\n%s", rest[0], webUsage)
	}
	hostport := net.JoinHostPort(f.addr, strconv.Itoa(f.port))
	ln, err := net.Listen("tcp", hostport)
	if err != nil {
		if errors.Is(err, syscall.EADDRINUSE) {
			return fmt.Errorf("serve: port %d on %s is already in use (another server is running there): stop it or choose another port with -port", f.port, f.addr)
		}
		return fmt.Errorf("serve: cannot listen on %s: %w", hostport, err)
	}
	defer ln.Close()
	if ip := net.ParseIP(f.addr); f.addr != "localhost" && (ip == nil || !ip.IsLoopback()) {
		fmt.Fprintf(stderr, "eddyblock: warning: serving on %s, reachable from other machines\n", f.addr)
	}
	src, err := sourceTree(ctx, f.src)
	if err != nil {
		return err
	}
	dir, err := os.MkdirTemp("", "eddyblock-site-")
	if err != nil {
		return fmt.Errorf("serve: %w", err)
	}
	defer os.RemoveAll(dir)
	fmt.Fprintln(stderr, "eddyblock: building the WebAssembly program…")
	if err := buildSite(ctx, src, dir); err != nil {
		return err
	}
	srv := &http.Server{Handler: siteHandler(dir), ReadHeaderTimeout: 10 * time.Second}
	done := make(chan error, 1)
	go func() { done <- srv.Serve(ln) }()
	fmt.Fprintf(stdout, "eddyblock: the browser demo is at http://%s/ (Ctrl-C stops the server)\n", ln.Addr())
	select {
	case err := <-done:
		return fmt.Errorf("serve: %w", err)
	case <-ctx.Done():
		sctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		_ = srv.Shutdown(sctx)
		return nil
	}
}

// siteHandler serves the site's own files from dir and nothing else: no
// directory listings, no other path, GET and HEAD only.
func siteHandler(dir string) http.Handler {
	files := map[string]string{"/": siteIndex}
	for _, f := range siteFiles() {
		files["/"+f] = f
	}
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			w.Header().Set("Allow", "GET, HEAD")
			http.Error(w, "method not allowed", http.StatusMethodNotAllowed)
			return
		}
		name, ok := files[r.URL.Path]
		if !ok {
			http.NotFound(w, r)
			return
		}
		fh, err := os.Open(filepath.Join(dir, filepath.FromSlash(name)))
		if err != nil {
			http.Error(w, "the file is missing from the built site", http.StatusInternalServerError)
			return
		}
		defer fh.Close()
		st, err := fh.Stat()
		if err != nil {
			http.Error(w, err.Error(), http.StatusInternalServerError)
			return
		}
		w.Header().Set("Cache-Control", "no-cache")
		w.Header().Set("X-Content-Type-Options", "nosniff")
		http.ServeContent(w, r, name, st.ModTime(), fh)
	})
}
