package livepage

import (
	"bufio"
	"encoding/json"
	"io"
	"io/fs"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
)

// startTest serves a page of dir on a free loopback port.
func startTest(t *testing.T, dir string) *Server {
	t.Helper()
	ln, err := Listen("127.0.0.1:0", false)
	if err != nil {
		t.Fatal(err)
	}
	s := Start(ln, dir)
	t.Cleanup(func() { s.Close() })
	return s
}

// get fetches path of the server with the given Host header ("" for the
// server's own), without following redirects.
func get(t *testing.T, s *Server, path, host string) (int, string) {
	t.Helper()
	addr := strings.TrimSuffix(strings.TrimPrefix(s.URL(), "http://"), "/")
	conn, err := net.Dial("tcp", addr)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	if host == "" {
		host = addr
	}
	io.WriteString(conn, "GET "+path+" HTTP/1.1\r\nHost: "+host+"\r\nConnection: close\r\n\r\n")
	resp, err := http.ReadResponse(bufio.NewReader(conn), nil)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, string(b)
}

// TestServesNothingOutsideTheRunFolder asks for files outside the run
// folder in every spelling: none is served. Common practice, no source.
func TestServesNothingOutsideTheRunFolder(t *testing.T) {
	base := t.TempDir()
	dir := filepath.Join(base, "run")
	os.MkdirAll(filepath.Join(dir, runfolder.FiguresDir), 0o755)
	os.WriteFile(filepath.Join(dir, runfolder.CaseFile), []byte("title = \"inside\"\n"), 0o644)
	os.WriteFile(filepath.Join(dir, runfolder.LockFile), []byte("holder"), 0o644)
	secret := filepath.Join(base, "secret.txt")
	os.WriteFile(secret, []byte("SECRET"), 0o644)
	os.Symlink(secret, filepath.Join(dir, "link.txt"))
	os.Symlink(base, filepath.Join(dir, runfolder.FiguresDir, "up"))
	s := startTest(t, dir)
	if code, body := get(t, s, "/files/"+runfolder.CaseFile, ""); code != 200 || !strings.Contains(body, "inside") {
		t.Fatalf("a file of the run folder: %d %q", code, body)
	}
	for _, p := range []string{
		"/files/../secret.txt",
		"/files/%2e%2e/secret.txt",
		"/files/..%2fsecret.txt",
		"/files/%2e%2e%2fsecret.txt",
		"/files/figures/../../secret.txt",
		"/files//" + strings.TrimPrefix(secret, "/"),
		"/files/" + secret,
		"/files/link.txt",
		"/files/figures/up/secret.txt",
		"/files/" + runfolder.LockFile,
		"/files/figures/%2e%2e/%2e%2e/secret.txt",
		"/../secret.txt",
		"/static/../../secret.txt",
	} {
		code, body := get(t, s, p, "")
		if strings.Contains(body, "SECRET") || strings.Contains(body, "holder") {
			t.Errorf("GET %s served a file outside the run folder (%d)", p, code)
		}
		if code == 200 {
			t.Errorf("GET %s: 200", p)
		}
	}
}

// TestRefusesOtherHostNames checks the defence against DNS rebinding: a
// loopback server answers only to loopback host names.
// Common practice, no source.
func TestRefusesOtherHostNames(t *testing.T) {
	s := startTest(t, "")
	for _, h := range []string{"localhost:8080", "127.0.0.1", "[::1]:80"} {
		if code, _ := get(t, s, "/", h); code != 200 {
			t.Errorf("Host %s: %d, want 200", h, code)
		}
	}
	for _, h := range []string{"evil.example", "evil.example:8080", "192.0.2.1"} {
		if code, _ := get(t, s, "/", h); code != http.StatusMisdirectedRequest {
			t.Errorf("Host %s: %d, want %d", h, code, http.StatusMisdirectedRequest)
		}
	}
}

// TestPageLoadsNothingFromElsewhere scans the embedded page for
// addresses of other machines and checks the content policy.
// Common practice, no source.
func TestPageLoadsNothingFromElsewhere(t *testing.T) {
	remote := regexp.MustCompile(`(?i)(https?:|wss?:|ftp:)?//[a-z0-9.-]+\.[a-z]{2,}|@import|url\(\s*['"]?https?:`)
	err := fs.WalkDir(pageFiles, "page", func(path string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, _ := pageFiles.ReadFile(path)
		if m := remote.Find(b); m != nil {
			t.Errorf("%s refers to another machine: %s", path, m)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	s := startTest(t, "")
	resp, err := http.Get(s.URL())
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	csp := resp.Header.Get("Content-Security-Policy")
	if !strings.Contains(csp, "default-src 'none'") || !strings.Contains(csp, "connect-src 'self'") {
		t.Errorf("content policy %q", csp)
	}
	for _, p := range []string{"/static/page.js", "/static/page.css"} {
		if code, _ := get(t, s, p, ""); code != 200 {
			t.Errorf("%s: %d", p, code)
		}
	}
}

// stream is one page's event stream.
type stream struct {
	resp *http.Response
	r    *bufio.Reader
}

func openStream(t *testing.T, s *Server) *stream {
	t.Helper()
	resp, err := http.Get(s.URL() + "events")
	if err != nil {
		t.Fatal(err)
	}
	if resp.StatusCode != 200 {
		t.Fatalf("events: %s", resp.Status)
	}
	t.Cleanup(func() { resp.Body.Close() })
	return &stream{resp: resp, r: bufio.NewReader(resp.Body)}
}

// next returns the next message of the stream.
func (st *stream) next(t *testing.T) message {
	t.Helper()
	for {
		line, err := st.r.ReadString('\n')
		if err != nil {
			t.Fatalf("event stream: %v", err)
		}
		if data, ok := strings.CutPrefix(line, "data: "); ok {
			var m message
			if err := json.Unmarshal([]byte(data), &m); err != nil {
				t.Fatalf("message: %v", err)
			}
			return m
		}
	}
}

// testView is a view of a 16 × 8 slice with a canopy below 0.25 m.
func testView(t float64) *View {
	g := h5.GridInfo{Lx: 2, H: 0.5}
	for i := range 16 {
		g.X = append(g.X, 2*float64(i)/16)
	}
	for k := range 9 {
		g.Zf = append(g.Zf, 0.5*float64(k)/8)
	}
	for k := range 8 {
		g.Zc = append(g.Zc, 0.5*(float64(k)+0.5)/8)
	}
	om := make([]float64, 9*16)
	for i := range om {
		om[i] = float64(i%16) - 8 + t
	}
	a := make([]float64, 8*16)
	for i := range 4 * 16 {
		a[i] = 10
	}
	pen := 0.1 + t
	return &View{Title: "test", State: Running, Time: t, EndTime: 10, ETA: time.Second, Grid: g, Frontal: a, CanopyHeight: 0.25,
		Fields:   []Field{{Name: "vorticity", Label: "ω [1/s]", Signed: true, Data: om}},
		ProfileZ: g.Zc, ProfileU: g.Zc, Metrics: Metrics(runfolder.FlowSummary{PenetrationDepth: &pen}, nil)}
}

// TestManyPagesAndReconnects opens many pages, publishes to them, closes
// some and reconnects: every page gets the newest view, a new page gets
// it at once, and a closed page is let go. Common practice, no source.
func TestManyPagesAndReconnects(t *testing.T) {
	s := startTest(t, "")
	const n = 20
	pages := make([]*stream, n)
	for i := range pages {
		pages[i] = openStream(t, s)
	}
	waitFor(t, func() bool { return s.Pages() == n })
	s.Publish(testView(1))
	var wg sync.WaitGroup
	for _, p := range pages {
		wg.Add(1)
		go func() {
			defer wg.Done()
			if m := p.next(t); m.Time != 1 || len(m.Maps) != 1 || len(m.Outline) == 0 {
				t.Errorf("page got t = %g, %d maps, %d outline pieces", m.Time, len(m.Maps), len(m.Outline))
			}
		}()
	}
	wg.Wait()
	for _, p := range pages[:n/2] {
		p.resp.Body.Close()
	}
	waitFor(t, func() bool { return s.Pages() == n-n/2 })
	again := openStream(t, s)
	if m := again.next(t); m.Time != 1 {
		t.Errorf("a reconnected page got t = %g first, want the newest view (1)", m.Time)
	}
}

// TestSlowPageGetsNewest publishes many views to a page that reads none
// of them: it then reads the newest, and Publish never waited.
// Common practice, no source.
func TestSlowPageGetsNewest(t *testing.T) {
	s := startTest(t, "")
	p := openStream(t, s)
	waitFor(t, func() bool { return s.Pages() == 1 })
	// A first view that the server has taken, so that the history holds
	// at least it and the newest.
	s.Publish(testView(0))
	waitFor(t, func() bool { return s.pending.Load() == nil })
	start := time.Now()
	for i := 1; i <= 200; i++ {
		s.Publish(testView(float64(i) / 20))
	}
	if el := time.Since(start); el > time.Second {
		t.Errorf("200 Publish calls took %v: Publish waits", el)
	}
	waitFor(t, func() bool { return s.published.Load() > 0 && s.pending.Load() == nil })
	var m message
	for m.Time != 10 {
		m = p.next(t)
	}
	if len(m.Metrics) == 0 || len(m.Metrics[0].History) < 2 {
		t.Errorf("the penetration depth's history holds %d points", len(m.Metrics[0].History))
	}
}

// TestTooManyPages checks the message when MaxPages pages follow.
// Common practice, no source.
func TestTooManyPages(t *testing.T) {
	s := startTest(t, "")
	for range MaxPages {
		openStream(t, s)
	}
	waitFor(t, func() bool { return s.Pages() == MaxPages })
	code, body := get(t, s, "/events", "")
	if code != http.StatusServiceUnavailable || !strings.Contains(body, "close one") {
		t.Errorf("page %d: %d %q", MaxPages+1, code, body)
	}
}

func waitFor(t *testing.T, cond func() bool) {
	t.Helper()
	deadline := time.Now().Add(10 * time.Second)
	for !cond() {
		if time.Now().After(deadline) {
			t.Fatal("timed out")
		}
		time.Sleep(5 * time.Millisecond)
	}
}
