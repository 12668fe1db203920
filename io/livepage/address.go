package livepage

import (
	"errors"
	"fmt"
	"net"
	"strconv"
	"strings"
	"syscall"
)

// ErrRemote reports an address that other machines can reach, refused
// unless the caller allows it explicitly.
var ErrRemote = errors.New("livepage: the address can be reached from other machines")

// DefaultAddress is the address a page binds when none is given: the
// loopback interface, port 8080.
const DefaultAddress = "127.0.0.1:8080"

// Listen binds addr (HOST:PORT; a bare PORT or :PORT means 127.0.0.1;
// port 0 picks a free port). An address that other machines can reach (a
// non-loopback IP, a host name that resolves to one, or an empty host
// before the colon, which the system reads as every interface) is refused
// with an error wrapping ErrRemote unless allowRemote is set. An address
// in use, a port without permission and an address that is not this
// machine's are reported with what to do.
func Listen(addr string, allowRemote bool) (net.Listener, error) {
	host, port, err := splitAddress(addr)
	if err != nil {
		return nil, err
	}
	if !allowRemote {
		if why := reachable(host); why != "" {
			return nil, fmt.Errorf("%w: %q %s, so anyone who can reach this machine would see the run; bind a loopback address such as %s, or allow other machines explicitly", ErrRemote, addr, why, DefaultAddress)
		}
	}
	ln, err := net.Listen("tcp", net.JoinHostPort(host, port))
	if err != nil {
		return nil, listenError(host, port, err)
	}
	return ln, nil
}

// listenError says why host:port cannot be bound and what to do.
func listenError(host, port string, err error) error {
	switch {
	case errors.Is(err, syscall.EADDRINUSE):
		return fmt.Errorf("livepage: address %s is in use by another program (another page or server on that port); choose another port, e.g. %s, or port 0 for any free one", net.JoinHostPort(host, port), net.JoinHostPort(host, "8081"))
	case errors.Is(err, syscall.EACCES):
		return fmt.Errorf("livepage: no permission to listen on port %s of %s (ports below 1024 need administrator rights); choose a port from 1024 up, e.g. %s", port, host, net.JoinHostPort(host, "8080"))
	case errors.Is(err, syscall.EADDRNOTAVAIL):
		return fmt.Errorf("livepage: %s is not an address of this machine; give one of its own, e.g. %s", host, DefaultAddress)
	}
	return fmt.Errorf("livepage: cannot listen on %s: %v", net.JoinHostPort(host, port), err)
}

// splitAddress splits HOST:PORT, reading a bare port as one on
// 127.0.0.1, and checks the port: a number from 0 to 65535.
func splitAddress(addr string) (host, port string, err error) {
	a := strings.TrimSpace(addr)
	bare := a != "" && !strings.Contains(a, ":")
	if bare {
		a = "127.0.0.1:" + a
	}
	host, port, err = net.SplitHostPort(a)
	if err != nil || port == "" {
		return "", "", fmt.Errorf("livepage: address %q is not HOST:PORT; give e.g. %s (or a port alone, e.g. 8080, for this machine only)", addr, DefaultAddress)
	}
	if n, perr := strconv.Atoi(port); perr != nil || n < 0 || n > 65535 {
		return "", "", fmt.Errorf("livepage: address %q: port %q is not a port number; give one from 1024 to 65535, e.g. %s", addr, port, DefaultAddress)
	}
	return host, port, nil
}

// reachable says why host can be reached from other machines, or "" for
// a loopback host.
func reachable(host string) string {
	if host == "" {
		return "has no host before the colon, which listens on every interface of this machine"
	}
	if strings.EqualFold(host, "localhost") {
		return ""
	}
	if ip := net.ParseIP(host); ip != nil {
		if ip.IsLoopback() {
			return ""
		}
		if ip.IsUnspecified() {
			return "listens on every interface of this machine"
		}
		return "is not a loopback address"
	}
	ips, err := net.LookupIP(host)
	if err != nil || len(ips) == 0 {
		return "names a host that does not resolve here to a loopback address"
	}
	for _, ip := range ips {
		if !ip.IsLoopback() {
			return fmt.Sprintf("resolves to %s, which is not a loopback address", ip)
		}
	}
	return ""
}

// loopbackHost tells whether the host part of a request's Host header
// names this machine's loopback interface.
func loopbackHost(hostport string) bool {
	h := hostport
	if hh, _, err := net.SplitHostPort(hostport); err == nil {
		h = hh
	}
	h = strings.Trim(h, "[]")
	if strings.EqualFold(h, "localhost") {
		return true
	}
	ip := net.ParseIP(h)
	return ip != nil && ip.IsLoopback()
}
