// The C half of the package's HDF5 binding, called from binding.go; each
// function's contract is in binding.c. All calls are made under the
// package lock on one locked OS thread.

#ifndef ROLLERBED_H5_BINDING_H
#define ROLLERBED_H5_BINDING_H

#include <stddef.h>

#include "hdf5.h"
#include "hdf5_hl.h"

const char *rb_error(void);
void rb_begin(void);
int rb_per_file_locking(void);
int rb_libversion(unsigned *major, unsigned *minor, unsigned *release);
hid_t rb_create(const char *name, int excl);
hid_t rb_open(const char *name, int write);
int rb_flush(hid_t f);
int rb_close(hid_t f);
int rb_link_exists(hid_t loc, const char *path);
int rb_kind(hid_t loc, const char *path);
int rb_create_group(hid_t loc, const char *path);
long long rb_count_links(hid_t loc, const char *path);
long rb_link_name(hid_t loc, const char *path, unsigned long long i, char *buf, size_t n);
int rb_delete(hid_t loc, const char *path);
int rb_write_f64(hid_t loc, const char *path, int rank, const hsize_t *dims, const hsize_t *chunk, int level, const double *data);
int rb_write_i64(hid_t loc, const char *path, long long v);
int rb_dims(hid_t loc, const char *path, hsize_t *dims, int max);
int rb_read(hid_t loc, const char *path, int mem, void *buf, unsigned long long n);
int rb_attr_exists(hid_t loc, const char *obj, const char *name);
int rb_set_attr(hid_t loc, const char *obj, const char *name, int kind, const void *value);
int rb_get_num(hid_t loc, const char *obj, const char *name, int kind, void *out);
char *rb_get_str(hid_t loc, const char *obj, const char *name, int *bad);
int rb_make_scale(hid_t loc, const char *path, const char *name);
int rb_attach(hid_t loc, const char *path, const char *scale, unsigned idx, int on);
int rb_is_scale(hid_t loc, const char *path);
int rb_write_virtual(hid_t loc, const char *path, int rank, const hsize_t *dims,
		int n, const char *const *srcs, const hsize_t *at);

#endif
