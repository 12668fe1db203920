package headless

import (
	"context"
	"fmt"
	"net/url"
	"os"
	"os/exec"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

// Env names a Chromium program to use instead of the first of chromium,
// chromium-browser and google-chrome on the PATH.
const Env = "ROLLERBED_CHROMIUM"

// Find returns the path of a Chromium program, or "" when there is none.
func Find() string {
	if p := os.Getenv(Env); p != "" {
		return p
	}
	for _, name := range []string{"chromium", "chromium-browser", "google-chrome"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	return ""
}

// Page is a tab of a headless browser with what it has logged.
type Page struct {
	Ctx context.Context // run chromedp actions with it

	mu       sync.Mutex
	errors   []string // console errors and uncaught exceptions
	requests []string // URLs the page asked for
}

// Browser starts a headless Chromium for the test and returns a tab in
// it; it is closed when the test ends. It skips the test when no
// Chromium is installed.
func Browser(t testing.TB, timeout time.Duration) *Page {
	t.Helper()
	exe := Find()
	if exe == "" {
		t.Skipf("no Chromium found (install it with scripts/install-chromium.sh, or set %s to its path): the browser test is skipped", Env)
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(exe),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-extensions", true),
		chromedp.Flag("disable-default-apps", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("force-color-profile", "srgb"),
		chromedp.Flag("hide-scrollbars", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1400, 1000),
	}
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelTab := chromedp.NewContext(actx)
	ctx, cancelTime := context.WithTimeout(ctx, timeout)
	t.Cleanup(func() {
		cancelTime()
		cancelTab()
		cancelAlloc()
	})
	p := &Page{Ctx: ctx}
	listen := func(ev any) {
		p.mu.Lock()
		defer p.mu.Unlock()
		switch e := ev.(type) {
		case *runtime.EventConsoleAPICalled:
			if e.Type == runtime.ConsoleAPICalledTypeError || e.Type == runtime.ConsoleAPICalledTypeAssert {
				var parts []string
				for _, a := range e.Args {
					parts = append(parts, string(a.Value)+a.Description)
				}
				p.errors = append(p.errors, "console: "+strings.Join(parts, " "))
			}
		case *runtime.EventExceptionThrown:
			d := e.ExceptionDetails
			msg := d.Text
			if d.Exception != nil {
				msg += " " + d.Exception.Description
			}
			p.errors = append(p.errors, fmt.Sprintf("exception at %s:%d: %s", d.URL, d.LineNumber, msg))
		case *network.EventRequestWillBeSent:
			p.requests = append(p.requests, e.Request.URL)
		}
	}
	start := func(ctx context.Context, tg *chromedp.Target) (chromedp.Void, error) {
		if _, err := cdp.Call(ctx, tg, network.Enable, network.EnableParams{}); err != nil {
			return chromedp.Void{}, err
		}
		_, err := cdp.Call(ctx, tg, runtime.Enable, cdp.Empty{})
		return chromedp.Void{}, err
	}
	err := chromedp.Listen(ctx, listen)
	if err == nil {
		err = chromedp.Do(ctx, start)
	}
	if err != nil {
		t.Skipf("Chromium (%s) does not start here: %v; the browser test is skipped", exe, err)
	}
	return p
}

// Errors returns the console errors and uncaught exceptions so far.
func (p *Page) Errors() []string {
	p.mu.Lock()
	defer p.mu.Unlock()
	return append([]string(nil), p.errors...)
}

// ForeignRequests returns the requests so far that went elsewhere than
// to this machine: every URL but data: URIs, file: URLs and http(s) URLs
// of localhost or a loopback address.
func (p *Page) ForeignRequests() []string {
	p.mu.Lock()
	defer p.mu.Unlock()
	var out []string
	for _, r := range p.requests {
		u, err := url.Parse(r)
		if err != nil {
			out = append(out, r)
			continue
		}
		switch u.Scheme {
		case "data", "file", "about", "blob":
			continue
		case "http", "https", "ws", "wss":
			h := u.Hostname()
			if h == "localhost" || strings.HasPrefix(h, "127.") || h == "::1" {
				continue
			}
		}
		out = append(out, r)
	}
	return out
}

// Requests returns every URL the page asked for so far.
func (p *Page) Requests() []string {
	p.mu.Lock()
	defer p.mu.Unlock()
	return append([]string(nil), p.requests...)
}
