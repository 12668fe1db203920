package livepage

import (
	"context"
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"net"
	"net/http"
	"os"
	"path"
	"strings"
	"sync"
	"sync/atomic"
	"time"
)

//go:embed page
var pageFiles embed.FS

// MaxPages is how many pages may follow a server at once; one more is
// told to close another.
const MaxPages = 64

// keepAlive is how often an idle event stream sends a comment line, so
// that proxies and browsers keep it open.
const keepAlive = 15 * time.Second

// Server serves the live page of one run. Make it with Start; hand it
// Views with Publish; stop it with Close.
type Server struct {
	ln       net.Listener
	srv      *http.Server
	dir      string // the run folder, "" when none is served
	loopback bool   // bound to a loopback address: check Host headers

	pending atomic.Pointer[View]
	wake    chan struct{}
	done    chan struct{}
	hist    history

	mu    sync.Mutex
	pages map[chan []byte]struct{}
	last  []byte // the newest message, nil before the first

	published atomic.Int64 // messages made, for tests
	drawing   atomic.Int64 // ns spent making messages
	closeOnce sync.Once
}

// Start serves the page on the listener ln (see Listen) until Close.
// When dir is not "", the files of that run folder are served read-only
// under /files/ (the folder need not exist yet).
func Start(ln net.Listener, dir string) *Server {
	s := &Server{ln: ln, wake: make(chan struct{}, 1), done: make(chan struct{}), hist: history{},
		pages: map[chan []byte]struct{}{}}
	if tcp, ok := ln.Addr().(*net.TCPAddr); ok {
		s.loopback = tcp.IP.IsLoopback()
	}
	s.dir = dir
	mux := http.NewServeMux()
	static, err := fs.Sub(pageFiles, "page")
	if err != nil {
		panic("livepage: the embedded page is missing: " + err.Error())
	}
	mux.Handle("GET /static/", http.StripPrefix("/static/", http.FileServerFS(static)))
	mux.HandleFunc("GET /{$}", func(w http.ResponseWriter, r *http.Request) {
		http.ServeFileFS(w, r, static, "index.html")
	})
	mux.HandleFunc("GET /events", s.events)
	mux.HandleFunc("GET /files/{name...}", s.file)
	s.srv = &http.Server{Handler: s.guard(mux), ReadHeaderTimeout: 10 * time.Second}
	go s.publishLoop()
	go s.srv.Serve(ln)
	return s
}

// URL is the address of the page, e.g. http://127.0.0.1:8080/.
func (s *Server) URL() string {
	a := s.ln.Addr().(*net.TCPAddr)
	host := a.IP.String()
	if a.IP.IsUnspecified() {
		host = "localhost"
	}
	return "http://" + net.JoinHostPort(host, fmt.Sprint(a.Port)) + "/"
}

// Publish hands v to the server and returns at once; the server draws it
// on its own goroutine and pushes it to the open pages. When views come
// faster than the server draws them, the newest wins.
func (s *Server) Publish(v *View) {
	s.pending.Store(v)
	select {
	case s.wake <- struct{}{}:
	default:
	}
}

// Close stops the server: the pages lose their connection (and reconnect
// when a server comes back on the address).
func (s *Server) Close() error {
	s.closeOnce.Do(func() { close(s.done) })
	ctx, cancel := context.WithTimeout(context.Background(), time.Second)
	defer cancel()
	err := s.srv.Shutdown(ctx)
	if errors.Is(err, context.DeadlineExceeded) {
		err = s.srv.Close() // event streams do not end on their own
	}
	return err
}

// publishLoop turns the newest published View into a message and sends it
// to every page. It records every view's metrics, but draws a view only
// while a page follows (the newest is drawn when one comes), and it rests
// dutyRest times as long as the last drawing took before the next, so
// that the page takes a small share of the machine whatever its load.
func (s *Server) publishLoop() {
	var waiting *View // the newest view, not drawn for want of a page
	for {
		select {
		case <-s.done:
			return
		case <-s.wake:
		}
		if v := s.pending.Swap(nil); v != nil {
			s.hist.add(v.Time, v.Metrics)
			waiting = v
		}
		if waiting == nil || s.Pages() == 0 {
			continue
		}
		start := time.Now()
		msg, err := encode(waiting, s.hist)
		waiting = nil
		if err != nil {
			continue // an image that does not encode: keep the last one
		}
		s.published.Add(1)
		s.drawing.Add(int64(time.Since(start)))
		s.broadcast(msg)
		select {
		case <-s.done:
			return
		case <-time.After(dutyRest * time.Since(start)):
		}
	}
}

// dutyRest is how many times as long as drawing a view the server rests
// before the next: drawing takes at most 1/(1+dutyRest) of a core.
const dutyRest = 50

// broadcast sends msg to every page; a page that has not taken the last
// one yet gets this one in its place.
func (s *Server) broadcast(msg []byte) {
	s.mu.Lock()
	defer s.mu.Unlock()
	s.last = msg
	for ch := range s.pages {
		select {
		case ch <- msg:
		default:
			select {
			case <-ch:
			default:
			}
			ch <- msg
		}
	}
}

// subscribe adds a page; it returns nil when MaxPages follow already.
func (s *Server) subscribe() (chan []byte, []byte) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if len(s.pages) >= MaxPages {
		return nil, nil
	}
	ch := make(chan []byte, 1)
	s.pages[ch] = struct{}{}
	select { // draw the newest view for the new page
	case s.wake <- struct{}{}:
	default:
	}
	return ch, s.last
}

func (s *Server) unsubscribe(ch chan []byte) {
	s.mu.Lock()
	defer s.mu.Unlock()
	delete(s.pages, ch)
}

// DrawingTime returns the wall time the server has spent turning views
// into messages.
func (s *Server) DrawingTime() time.Duration { return time.Duration(s.drawing.Load()) }

// Pages returns how many pages follow the server now.
func (s *Server) Pages() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return len(s.pages)
}

// events streams the messages to one page as server-sent events.
func (s *Server) events(w http.ResponseWriter, r *http.Request) {
	fl, ok := w.(http.Flusher)
	if !ok {
		http.Error(w, "streaming is not supported here", http.StatusInternalServerError)
		return
	}
	ch, last := s.subscribe()
	if ch == nil {
		http.Error(w, fmt.Sprintf("%d pages follow this run already: close one and reload", MaxPages), http.StatusServiceUnavailable)
		return
	}
	defer s.unsubscribe(ch)
	h := w.Header()
	h.Set("Content-Type", "text/event-stream")
	h.Set("Cache-Control", "no-store")
	fmt.Fprint(w, "retry: 2000\n\n")
	if last != nil {
		writeEvent(w, last)
	}
	fl.Flush()
	tick := time.NewTicker(keepAlive)
	defer tick.Stop()
	for {
		select {
		case <-r.Context().Done():
			return
		case <-s.done:
			return
		case msg := <-ch:
			writeEvent(w, msg)
			fl.Flush()
		case <-tick.C:
			fmt.Fprint(w, ": still here\n\n")
			fl.Flush()
		}
	}
}

// writeEvent writes one message event (the JSON holds no newlines).
func writeEvent(w http.ResponseWriter, msg []byte) {
	fmt.Fprintf(w, "event: view\ndata: %s\n\n", msg)
}

// file serves a file of the run folder. Names that lead outside the
// folder (through "..", an absolute path or a symbolic link) are refused
// by the os.Root; hidden files (the lock file) are not served.
func (s *Server) file(w http.ResponseWriter, r *http.Request) {
	name := r.PathValue("name")
	if s.dir == "" {
		http.Error(w, "this page serves no run folder", http.StatusNotFound)
		return
	}
	clean := path.Clean("/" + name)[1:]
	if clean != name || name == "" || strings.HasPrefix(path.Base(name), ".") || strings.Contains(name, "/.") {
		http.Error(w, "no such file in the run folder", http.StatusNotFound)
		return
	}
	root, err := os.OpenRoot(s.dir)
	if err != nil {
		http.Error(w, "the run folder cannot be read", http.StatusNotFound)
		return
	}
	defer root.Close()
	f, err := root.Open(name)
	if err != nil {
		http.Error(w, "no such file in the run folder", http.StatusNotFound)
		return
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil || !st.Mode().IsRegular() {
		http.Error(w, "no such file in the run folder", http.StatusNotFound)
		return
	}
	w.Header().Set("X-Content-Type-Options", "nosniff")
	http.ServeContent(w, r, st.Name(), st.ModTime(), f)
}

// contentPolicy allows the page its own files, the pictures in data URIs
// and nothing else.
const contentPolicy = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data:; connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'"

// guard refuses requests for other host names than a loopback one on a
// loopback server, and sets the content policy.
func (s *Server) guard(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if s.loopback && !loopbackHost(r.Host) {
			http.Error(w, "this page answers only to localhost or 127.0.0.1", http.StatusMisdirectedRequest)
			return
		}
		w.Header().Set("Content-Security-Policy", contentPolicy)
		w.Header().Set("Referrer-Policy", "no-referrer")
		next.ServeHTTP(w, r)
	})
}
