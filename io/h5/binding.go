package h5

/*
#cgo pkg-config: hdf5
#cgo LDFLAGS: -lhdf5_hl
#include <stdlib.h>
#include "binding.h"
*/
import "C"

import (
	"errors"
	"fmt"
	"os"
	"runtime"
	"strings"
	"sync"
	"unsafe"
)

// lib serialises all use of the HDF5 library: builds of the library are
// not all thread safe, its error stack is per OS thread, and every
// operation of this package opens, changes and closes a file as one unit.
var lib sync.Mutex

// lockingOff runs once, before the first use of the library.
var lockingOff sync.Once

// lockingEnv is HDF5's own switch for file locks, read at every open.
const lockingEnv = "HDF5_USE_FILE_LOCKING"

// lockingFallback turns HDF5's file locks off through its environment
// switch when the library cannot do it per file (perFile false: HDF5
// before 1.10.7, or 1.12.0), so that a viewer holding fields.h5 open does
// not stop a run there either. A value the user set is left alone. It
// reports whether it set the switch.
func lockingFallback(perFile bool) bool {
	if perFile {
		return false
	}
	if _, set := os.LookupEnv(lockingEnv); set {
		return false
	}
	return os.Setenv(lockingEnv, "FALSE") == nil
}

// enter takes the library for one operation and pins the goroutine to its
// OS thread; call the returned function to release both.
func enter() func() {
	lockingOff.Do(func() { lockingFallback(C.rb_per_file_locking() != 0) })
	lib.Lock()
	runtime.LockOSThread()
	C.rb_begin()
	return func() {
		runtime.UnlockOSThread()
		lib.Unlock()
	}
}

// errWrongShape is returned by the binding when a dataset or attribute is
// of another kind or size than asked for.
var errWrongShape = errors.New("wrong type or size")

// libError returns the library's reason for the last failure.
func libError() error {
	msg := strings.Join(strings.Fields(C.GoString(C.rb_error())), " ")
	if msg == "" {
		msg = "the HDF5 library gave no reason"
	}
	return errors.New(msg)
}

// notAFile says, in a phrase, why path cannot be an HDF5 file (a folder, a
// pipe, a device), or "" when it is a regular file or missing.
func notAFile(path string) string {
	st, err := os.Stat(path)
	switch {
	case err != nil || st.Mode().IsRegular():
		return ""
	case st.IsDir():
		return "is a folder, not an HDF5 file"
	}
	return "is not a regular file (a pipe or a device), not an HDF5 file"
}

// LibraryVersion returns the version of the HDF5 library this process
// uses, as the library reports it at run time ("1.10.8"), or "unknown"
// with the library's reason when it cannot tell.
func LibraryVersion() (string, error) {
	defer enter()()
	var major, minor, release C.uint
	if C.rb_libversion(&major, &minor, &release) < 0 {
		return "unknown", fmt.Errorf("h5: the HDF5 library does not tell its version: %v", libError())
	}
	return fmt.Sprintf("%d.%d.%d", major, minor, release), nil
}

// file is an open HDF5 file.
type file struct {
	id   C.hid_t
	path string
}

func cstr(s string) *C.char { return C.CString(s) }

// createFile creates path, failing if it exists when excl is set and
// truncating it otherwise.
func createFile(path string, excl bool) (*file, error) {
	cp := cstr(path)
	defer C.free(unsafe.Pointer(cp))
	e := C.int(0)
	if excl {
		e = 1
	}
	id := C.rb_create(cp, e)
	if id < 0 {
		return nil, libError()
	}
	return &file{id: id, path: path}, nil
}

// openFile opens path read-only, or for reading and writing.
func openFile(path string, write bool) (*file, error) {
	if why := notAFile(path); why != "" {
		return nil, errors.New(why)
	}
	cp := cstr(path)
	defer C.free(unsafe.Pointer(cp))
	w := C.int(0)
	if write {
		w = 1
	}
	id := C.rb_open(cp, w)
	if id < 0 {
		return nil, libError()
	}
	return &file{id: id, path: path}, nil
}

func (f *file) flush() error {
	if C.rb_flush(f.id) < 0 {
		return libError()
	}
	return nil
}

// close flushes and closes the file; it is safe to call twice.
func (f *file) close() error {
	if f.id < 0 {
		return nil
	}
	id := f.id
	f.id = -1
	if C.rb_close(id) < 0 {
		return libError()
	}
	return nil
}

// exists reports whether the absolute path names an object, walking its
// components so that a missing group above is no failure.
func (f *file) exists(path string) bool {
	if path == "/" {
		return true
	}
	parts := strings.Split(strings.TrimPrefix(path, "/"), "/")
	for i := range parts {
		p := cstr("/" + strings.Join(parts[:i+1], "/"))
		r := C.rb_link_exists(f.id, p)
		C.free(unsafe.Pointer(p))
		if r <= 0 {
			return false
		}
	}
	return true
}

type kind int

const (
	kindOther kind = iota
	kindGroup
	kindDataset
)

func (f *file) kind(path string) (kind, error) {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	switch C.rb_kind(f.id, p) {
	case 1:
		return kindGroup, nil
	case 2:
		return kindDataset, nil
	case 0:
		return kindOther, nil
	}
	return kindOther, libError()
}

func (f *file) createGroup(path string) error {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	if C.rb_create_group(f.id, p) < 0 {
		return libError()
	}
	return nil
}

// children lists the names of the links in group path, in name order.
func (f *file) children(path string) ([]string, error) {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	n := C.rb_count_links(f.id, p)
	if n < 0 {
		return nil, libError()
	}
	names := make([]string, 0, int(n))
	buf := make([]byte, 256)
	for i := 0; i < int(n); i++ {
		for {
			l := C.rb_link_name(f.id, p, C.ulonglong(i), (*C.char)(unsafe.Pointer(&buf[0])), C.size_t(len(buf)))
			if l < 0 {
				return nil, libError()
			}
			if int(l) < len(buf) {
				names = append(names, string(buf[:l]))
				break
			}
			buf = make([]byte, int(l)+1)
		}
	}
	return names, nil
}

// remove unlinks path. The space it held stays in the file.
func (f *file) remove(path string) error {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	if C.rb_delete(f.id, p) < 0 {
		return libError()
	}
	return nil
}

// chunkValues is the target size of one compressed chunk, in values (1 MiB).
const chunkValues = 1 << 17

// writeF64 creates dataset path (and missing groups) with extent dims and
// writes data; level 1–9 compresses it in chunks of whole rows.
func (f *file) writeF64(path string, data []float64, dims []int, level int) error {
	n := 1
	for _, d := range dims {
		n *= d
	}
	if n != len(data) {
		panic(fmt.Sprintf("h5: %d values for extent %v", len(data), dims))
	}
	cd := make([]C.hsize_t, len(dims)+1)
	ch := make([]C.hsize_t, len(dims)+1)
	rest := 1
	for i := len(dims) - 1; i >= 0; i-- {
		cd[i] = C.hsize_t(dims[i])
		ch[i] = C.hsize_t(dims[i])
		if i == 0 {
			rows := max(1, min(dims[0], chunkValues/max(rest, 1)))
			ch[0] = C.hsize_t(rows)
		}
		rest *= dims[i]
	}
	if n == 0 || len(dims) == 0 {
		level = 0
	}
	var ptr *C.double
	if n > 0 {
		ptr = (*C.double)(unsafe.Pointer(&data[0]))
	}
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	if C.rb_write_f64(f.id, p, C.int(len(dims)), &cd[0], &ch[0], C.int(level), ptr) < 0 {
		return libError()
	}
	return nil
}

// writeI64 creates a scalar integer dataset.
func (f *file) writeI64(path string, v int64) error {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	if C.rb_write_i64(f.id, p, C.longlong(v)) < 0 {
		return libError()
	}
	return nil
}

// maxRank is the largest dataset rank this package reads.
const maxRank = 4

// dims returns the extent of dataset path (empty for a scalar).
func (f *file) dims(path string) ([]int, error) {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	var d [maxRank]C.hsize_t
	r := C.rb_dims(f.id, p, &d[0], maxRank)
	switch {
	case r == -2:
		return nil, fmt.Errorf("more than %d dimensions", maxRank)
	case r < 0:
		return nil, libError()
	}
	out := make([]int, int(r))
	for i := range out {
		out[i] = int(d[i])
	}
	return out, nil
}

// readF64 reads dataset path, which must hold n values, as float64.
func (f *file) readF64(path string, n int) ([]float64, error) {
	out := make([]float64, n)
	var ptr unsafe.Pointer
	if n > 0 {
		ptr = unsafe.Pointer(&out[0])
	}
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	switch C.rb_read(f.id, p, 0, ptr, C.ulonglong(n)) {
	case 0:
		return out, nil
	case -2:
		return nil, fmt.Errorf("%s: %w (want %d floating-point values)", path, errWrongShape, n)
	}
	return nil, libError()
}

// readI64 reads the scalar integer dataset path.
func (f *file) readI64(path string) (int64, error) {
	var v C.longlong
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	switch C.rb_read(f.id, p, 1, unsafe.Pointer(&v), 1) {
	case 0:
		return int64(v), nil
	case -2:
		return 0, fmt.Errorf("%s: %w (want one integer)", path, errWrongShape)
	}
	return 0, libError()
}

func (f *file) hasAttr(obj, name string) bool {
	o, n := cstr(obj), cstr(name)
	defer C.free(unsafe.Pointer(o))
	defer C.free(unsafe.Pointer(n))
	return C.rb_attr_exists(f.id, o, n) > 0
}

func (f *file) setAttr(obj, name string, kind C.int, value unsafe.Pointer) error {
	o, n := cstr(obj), cstr(name)
	defer C.free(unsafe.Pointer(o))
	defer C.free(unsafe.Pointer(n))
	if C.rb_set_attr(f.id, o, n, kind, value) < 0 {
		return fmt.Errorf("attribute %s of %s: %w", name, obj, libError())
	}
	return nil
}

func (f *file) setFloat(obj, name string, v float64) error {
	c := C.double(v)
	return f.setAttr(obj, name, 0, unsafe.Pointer(&c))
}

func (f *file) setInt(obj, name string, v int64) error {
	c := C.longlong(v)
	return f.setAttr(obj, name, 1, unsafe.Pointer(&c))
}

func (f *file) setUint(obj, name string, v uint64) error {
	c := C.ulonglong(v)
	return f.setAttr(obj, name, 2, unsafe.Pointer(&c))
}

// setString writes a variable-length UTF-8 string attribute; s must not
// hold a NUL byte (callers check).
func (f *file) setString(obj, name, s string) error {
	c := cstr(s)
	defer C.free(unsafe.Pointer(c))
	// The pointer to the C string is itself C memory, as cgo requires.
	pp := (**C.char)(C.malloc(C.size_t(unsafe.Sizeof(c))))
	defer C.free(unsafe.Pointer(pp))
	*pp = c
	return f.setAttr(obj, name, 3, unsafe.Pointer(pp))
}

func (f *file) getNum(obj, name string, kind C.int, out unsafe.Pointer) error {
	o, n := cstr(obj), cstr(name)
	defer C.free(unsafe.Pointer(o))
	defer C.free(unsafe.Pointer(n))
	switch C.rb_get_num(f.id, o, n, kind, out) {
	case 0:
		return nil
	case -2:
		return fmt.Errorf("attribute %s of %s: %w (want one number)", name, obj, errWrongShape)
	}
	return fmt.Errorf("attribute %s of %s: %w", name, obj, libError())
}

func (f *file) getFloat(obj, name string) (float64, error) {
	var v C.double
	err := f.getNum(obj, name, 0, unsafe.Pointer(&v))
	return float64(v), err
}

func (f *file) getInt(obj, name string) (int64, error) {
	var v C.longlong
	err := f.getNum(obj, name, 1, unsafe.Pointer(&v))
	return int64(v), err
}

func (f *file) getUint(obj, name string) (uint64, error) {
	var v C.ulonglong
	err := f.getNum(obj, name, 2, unsafe.Pointer(&v))
	return uint64(v), err
}

func (f *file) getString(obj, name string) (string, error) {
	o, n := cstr(obj), cstr(name)
	defer C.free(unsafe.Pointer(o))
	defer C.free(unsafe.Pointer(n))
	var bad C.int
	s := C.rb_get_str(f.id, o, n, &bad)
	if s == nil {
		if bad != 0 {
			return "", fmt.Errorf("attribute %s of %s: %w (want a string)", name, obj, errWrongShape)
		}
		return "", fmt.Errorf("attribute %s of %s: %w", name, obj, libError())
	}
	defer C.free(unsafe.Pointer(s))
	return C.GoString(s), nil
}

// makeScale turns the 1-D dataset path into a dimension scale called name.
func (f *file) makeScale(path, name string) error {
	p, n := cstr(path), cstr(name)
	defer C.free(unsafe.Pointer(p))
	defer C.free(unsafe.Pointer(n))
	if C.rb_make_scale(f.id, p, n) < 0 {
		return fmt.Errorf("dimension scale %s: %w", path, libError())
	}
	return nil
}

// attach attaches (on) or detaches the dimension scale scale to dimension
// dim of dataset path.
func (f *file) attach(path, scale string, dim int, on bool) error {
	p, s := cstr(path), cstr(scale)
	defer C.free(unsafe.Pointer(p))
	defer C.free(unsafe.Pointer(s))
	o := C.int(0)
	if on {
		o = 1
	}
	if C.rb_attach(f.id, p, s, C.uint(dim), o) < 0 {
		return fmt.Errorf("dimension %d of %s and the scale %s: %w", dim, path, scale, libError())
	}
	return nil
}

// isScale reports whether dataset path is a dimension scale.
func (f *file) isScale(path string) bool {
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	return C.rb_is_scale(f.id, p) > 0
}

// writeVirtual creates the float64 virtual dataset path of extent dims
// whose index at[j] along the first dimension is the dataset srcs[j] of
// this file (of extent dims[1:]); indexes no source maps read as NaN.
func (f *file) writeVirtual(path string, dims []int, srcs []string, at []int) error {
	if len(srcs) != len(at) || len(dims) < 2 {
		panic("h5: virtual dataset " + path + ": sources and indexes do not match")
	}
	cd := make([]C.hsize_t, len(dims))
	for i, d := range dims {
		cd[i] = C.hsize_t(d)
	}
	n := max(len(srcs), 1)
	// Arrays handed to C hold C pointers only, in C memory.
	cs := (*[1 << 28]*C.char)(C.malloc(C.size_t(n) * C.size_t(unsafe.Sizeof((*C.char)(nil)))))[:n:n]
	ca := (*[1 << 28]C.hsize_t)(C.malloc(C.size_t(n) * C.size_t(unsafe.Sizeof(C.hsize_t(0)))))[:n:n]
	defer C.free(unsafe.Pointer(&cs[0]))
	defer C.free(unsafe.Pointer(&ca[0]))
	for j, s := range srcs {
		cs[j] = cstr(s)
		ca[j] = C.hsize_t(at[j])
	}
	defer func() {
		for j := range srcs {
			C.free(unsafe.Pointer(cs[j]))
		}
	}()
	p := cstr(path)
	defer C.free(unsafe.Pointer(p))
	if C.rb_write_virtual(f.id, p, C.int(len(dims)), &cd[0], C.int(len(srcs)), &cs[0], &ca[0]) < 0 {
		return libError()
	}
	return nil
}
