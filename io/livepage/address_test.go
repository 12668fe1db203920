package livepage

import (
	"errors"
	"net"
	"os"
	"strings"
	"syscall"
	"testing"
)

// TestListenRefusesRemoteAddresses checks that only loopback addresses
// are bound unless other machines are allowed explicitly.
// Common practice, no source.
func TestListenRefusesRemoteAddresses(t *testing.T) {
	for _, addr := range []string{":0", "0.0.0.0:0", "[::]:0", "192.0.2.1:0"} {
		ln, err := Listen(addr, false)
		if err == nil {
			ln.Close()
			t.Errorf("Listen(%q) bound an address other machines can reach", addr)
			continue
		}
		if !errors.Is(err, ErrRemote) || !strings.Contains(err.Error(), DefaultAddress) {
			t.Errorf("Listen(%q): %v; want ErrRemote with the loopback fix", addr, err)
		}
	}
	ln, err := Listen("0.0.0.0:0", true)
	if err != nil {
		t.Fatalf("Listen allowed remote: %v", err)
	}
	ln.Close()
}

// TestListenLoopback binds loopback addresses in their spellings.
// Common practice, no source.
func TestListenLoopback(t *testing.T) {
	for _, addr := range []string{"127.0.0.1:0", "localhost:0", "0", "[::1]:0"} {
		ln, err := Listen(addr, false)
		if addr == "[::1]:0" && err != nil && strings.Contains(err.Error(), "not an address of this machine") {
			continue // no IPv6 loopback here
		}
		if err != nil {
			t.Errorf("Listen(%q): %v", addr, err)
			continue
		}
		if ip := ln.Addr().(*net.TCPAddr).IP; !ip.IsLoopback() {
			t.Errorf("Listen(%q) bound %v", addr, ip)
		}
		ln.Close()
	}
}

// TestListenErrors checks the messages for an address in use, a port
// without permission, a foreign address and malformed addresses.
// Common practice, no source.
func TestListenErrors(t *testing.T) {
	busy, err := Listen("127.0.0.1:0", false)
	if err != nil {
		t.Fatal(err)
	}
	defer busy.Close()
	_, err = Listen(busy.Addr().String(), false)
	if err == nil || !strings.Contains(err.Error(), "in use by another program") || !strings.Contains(err.Error(), "port 0") {
		t.Errorf("address in use: %v", err)
	}
	// A port below 1024 binds for root, so the message is checked on the
	// error the system gives other users.
	perm := listenError("127.0.0.1", "80", &net.OpError{Op: "listen", Net: "tcp", Err: os.NewSyscallError("bind", syscall.EACCES)})
	if !strings.Contains(perm.Error(), "no permission to listen on port 80") || !strings.Contains(perm.Error(), "1024") {
		t.Errorf("port without permission: %v", perm)
	}
	for _, tc := range []struct{ addr, want string }{
		{"", "not HOST:PORT"},
		{"127.0.0.1", "not a port number"},
		{"127.0.0.1:http", "not a port number"},
		{"127.0.0.1:70000", "not a port number"},
		{"127.0.0.1:-1", "not a port number"},
		{"a:b:c", "not HOST:PORT"},
	} {
		if _, err := Listen(tc.addr, false); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("Listen(%q): %v, want %q", tc.addr, err, tc.want)
		}
	}
}

// FuzzSplitAddress checks that any text either splits into a host and a
// numeric port or is refused with a message, never a panic.
func FuzzSplitAddress(f *testing.F) {
	for _, s := range []string{"127.0.0.1:8080", "8080", ":0", "[::1]:80", "localhost:", "a:b:c", "", "\x00:1"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, addr string) {
		host, port, err := splitAddress(addr)
		if err != nil {
			if !strings.HasPrefix(err.Error(), "livepage: ") {
				t.Errorf("%q: error without the package name: %v", addr, err)
			}
			return
		}
		if port == "" || strings.ContainsAny(port, ":[]") {
			t.Errorf("%q: port %q", addr, port)
		}
		_ = host
	})
}
