// The C half of the package's HDF5 binding (binding.go is the Go half).
// Every function returns a negative value (or NULL) on failure, with the
// library's own message kept for rb_error; binding.h lists them.

#include <stdlib.h>
#include <string.h>

#include "binding.h"

// rb_err holds the text of the last failure. Every call into this file is
// made under the package lock on one locked OS thread, so one buffer serves.
static char rb_err[1024];

typedef struct {
	char inner[480];
	char outer[480];
	int n;
} rb_walkdata;

static herr_t rb_walk(unsigned n, const H5E_error2_t *e, void *p) {
	rb_walkdata *w = p;
	if (e == NULL || e->desc == NULL || e->desc[0] == 0) {
		return 0;
	}
	if (w->n == 0) {
		strncpy(w->inner, e->desc, sizeof w->inner - 1);
	}
	strncpy(w->outer, e->desc, sizeof w->outer - 1);
	w->n++;
	return 0;
}

// rb_capture copies the library's error stack (the outermost and the
// innermost message) into rb_err. It must run before any cleanup call,
// which would clear the stack.
static void rb_capture(void) {
	rb_walkdata w;
	memset(&w, 0, sizeof w);
	H5Ewalk2(H5E_DEFAULT, H5E_WALK_UPWARD, rb_walk, &w);
	if (w.n == 0) {
		strcpy(rb_err, "the HDF5 library gave no reason");
	} else if (w.n == 1 || strcmp(w.inner, w.outer) == 0) {
		snprintf(rb_err, sizeof rb_err, "%s", w.inner);
	} else {
		snprintf(rb_err, sizeof rb_err, "%s: %s", w.outer, w.inner);
	}
}

const char *rb_error(void) { return rb_err; }

// rb_begin silences the library's own printing of errors (a per-thread
// setting in thread-safe builds) and clears the last failure.
void rb_begin(void) {
	H5Eset_auto2(H5E_DEFAULT, NULL, NULL);
	rb_err[0] = 0;
}

// rb_fapl returns file-access properties: objects are closed with the
// file, and the file is not locked (see doc.go: a viewer holding fields.h5
// open must not stop the run; cluster filesystems without flock must
// work).
static hid_t rb_fapl(void) {
	hid_t p = H5Pcreate(H5P_FILE_ACCESS);
	if (p < 0) {
		rb_capture();
		return -1;
	}
	if (H5Pset_fclose_degree(p, H5F_CLOSE_STRONG) < 0) {
		rb_capture();
		H5Pclose(p);
		return -1;
	}
#if H5_VERSION_GE(1, 12, 1) || (H5_VERS_MAJOR == 1 && H5_VERS_MINOR == 10 && H5_VERS_RELEASE >= 7)
	if (H5Pset_file_locking(p, 0, 1) < 0) {
		rb_capture();
		H5Pclose(p);
		return -1;
	}
#endif
	return p;
}

// rb_per_file_locking tells whether this library turns file locks off per
// file (H5Pset_file_locking: HDF5 1.10.7 and 1.12.1 on).
int rb_per_file_locking(void) {
#if H5_VERSION_GE(1, 12, 1) || (H5_VERS_MAJOR == 1 && H5_VERS_MINOR == 10 && H5_VERS_RELEASE >= 7)
	return 1;
#else
	return 0;
#endif
}

// rb_libversion stores the version of the HDF5 library in use (not the
// headers this file was compiled with) in major, minor and release.
int rb_libversion(unsigned *major, unsigned *minor, unsigned *release) {
	if (H5get_libversion(major, minor, release) < 0) {
		rb_capture();
		return -1;
	}
	return 0;
}

hid_t rb_create(const char *name, int excl) {
	hid_t fapl = rb_fapl();
	if (fapl < 0) {
		return -1;
	}
	hid_t f = H5Fcreate(name, excl ? H5F_ACC_EXCL : H5F_ACC_TRUNC, H5P_DEFAULT, fapl);
	if (f < 0) {
		rb_capture();
	}
	H5Pclose(fapl);
	return f;
}

hid_t rb_open(const char *name, int write) {
	hid_t fapl = rb_fapl();
	if (fapl < 0) {
		return -1;
	}
	hid_t f = H5Fopen(name, write ? H5F_ACC_RDWR : H5F_ACC_RDONLY, fapl);
	if (f < 0) {
		rb_capture();
	}
	H5Pclose(fapl);
	return f;
}

int rb_flush(hid_t f) {
	if (H5Fflush(f, H5F_SCOPE_LOCAL) < 0) {
		rb_capture();
		return -1;
	}
	return 0;
}

int rb_close(hid_t f) {
	if (H5Fclose(f) < 0) {
		rb_capture();
		return -1;
	}
	return 0;
}

// rb_link_exists reports whether path names a link; every component of the
// path before the last must exist (the caller walks it).
int rb_link_exists(hid_t loc, const char *path) {
	htri_t r = H5Lexists(loc, path, H5P_DEFAULT);
	if (r < 0) {
		rb_capture();
		return -1;
	}
	return r > 0;
}

// rb_kind returns 1 for a group, 2 for a dataset, 0 for anything else.
int rb_kind(hid_t loc, const char *path) {
	hid_t o = H5Oopen(loc, path, H5P_DEFAULT);
	if (o < 0) {
		rb_capture();
		return -1;
	}
	H5I_type_t t = H5Iget_type(o);
	H5Oclose(o);
	if (t == H5I_GROUP) {
		return 1;
	}
	if (t == H5I_DATASET) {
		return 2;
	}
	return 0;
}

int rb_create_group(hid_t loc, const char *path) {
	hid_t lcpl = H5Pcreate(H5P_LINK_CREATE);
	if (lcpl < 0 || H5Pset_create_intermediate_group(lcpl, 1) < 0) {
		rb_capture();
		if (lcpl >= 0) {
			H5Pclose(lcpl);
		}
		return -1;
	}
	hid_t g = H5Gcreate2(loc, path, lcpl, H5P_DEFAULT, H5P_DEFAULT);
	if (g < 0) {
		rb_capture();
		H5Pclose(lcpl);
		return -1;
	}
	H5Gclose(g);
	H5Pclose(lcpl);
	return 0;
}

long long rb_count_links(hid_t loc, const char *path) {
	H5G_info_t info;
	if (H5Gget_info_by_name(loc, path, &info, H5P_DEFAULT) < 0) {
		rb_capture();
		return -1;
	}
	return (long long)info.nlinks;
}

// rb_link_name writes the name of link i (in name order) of group path into
// buf and returns its length, or -1.
long rb_link_name(hid_t loc, const char *path, unsigned long long i, char *buf, size_t n) {
	ssize_t r = H5Lget_name_by_idx(loc, path, H5_INDEX_NAME, H5_ITER_INC, (hsize_t)i, buf, n, H5P_DEFAULT);
	if (r < 0) {
		rb_capture();
		return -1;
	}
	return (long)r;
}

int rb_delete(hid_t loc, const char *path) {
	if (H5Ldelete(loc, path, H5P_DEFAULT) < 0) {
		rb_capture();
		return -1;
	}
	return 0;
}

// rb_create_dataset creates dataset path of type t and extent space with
// the creation properties dcpl, and the groups above it that are missing.
static hid_t rb_create_dataset(hid_t loc, const char *path, hid_t t, hid_t space, hid_t dcpl) {
	hid_t lcpl = H5Pcreate(H5P_LINK_CREATE);
	if (lcpl < 0 || H5Pset_create_intermediate_group(lcpl, 1) < 0) {
		rb_capture();
		if (lcpl >= 0) H5Pclose(lcpl);
		return -1;
	}
	hid_t d = H5Dcreate2(loc, path, t, space, lcpl, dcpl, H5P_DEFAULT);
	if (d < 0) rb_capture();
	H5Pclose(lcpl);
	return d;
}

// rb_write_f64 creates dataset path (and missing groups above it) of rank
// dimensions as little-endian IEEE doubles and writes data, which may be
// NULL when the dataset is empty. A level of 1 to 9 stores it in chunks
// with the shuffle and deflate filters.
int rb_write_f64(hid_t loc, const char *path, int rank, const hsize_t *dims,
		const hsize_t *chunk, int level, const double *data) {
	int rc = -1;
	hid_t space = -1, dcpl = -1, d = -1;
	space = rank == 0 ? H5Screate(H5S_SCALAR) : H5Screate_simple(rank, dims, NULL);
	if (space < 0) { rb_capture(); goto done; }
	dcpl = H5Pcreate(H5P_DATASET_CREATE);
	if (dcpl < 0) { rb_capture(); goto done; }
	if (level > 0) {
		if (H5Pset_chunk(dcpl, rank, chunk) < 0 || H5Pset_shuffle(dcpl) < 0 ||
				H5Pset_deflate(dcpl, (unsigned)level) < 0) {
			rb_capture();
			goto done;
		}
	}
	d = rb_create_dataset(loc, path, H5T_IEEE_F64LE, space, dcpl);
	if (d < 0) goto done;
	if (data != NULL && H5Dwrite(d, H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, data) < 0) {
		rb_capture();
		goto done;
	}
	if (H5Dclose(d) < 0) { d = -1; rb_capture(); goto done; }
	d = -1;
	rc = 0;
done:
	if (d >= 0) H5Dclose(d);
	if (dcpl >= 0) H5Pclose(dcpl);
	if (space >= 0) H5Sclose(space);
	return rc;
}

// rb_write_i64 creates a scalar little-endian 64-bit integer dataset.
int rb_write_i64(hid_t loc, const char *path, long long v) {
	int rc = -1;
	hid_t space = -1, d = -1;
	space = H5Screate(H5S_SCALAR);
	if (space < 0) { rb_capture(); goto done; }
	d = rb_create_dataset(loc, path, H5T_STD_I64LE, space, H5P_DEFAULT);
	if (d < 0) goto done;
	if (H5Dwrite(d, H5T_NATIVE_LLONG, H5S_ALL, H5S_ALL, H5P_DEFAULT, &v) < 0) { rb_capture(); goto done; }
	if (H5Dclose(d) < 0) { d = -1; rb_capture(); goto done; }
	d = -1;
	rc = 0;
done:
	if (d >= 0) H5Dclose(d);
	if (space >= 0) H5Sclose(space);
	return rc;
}

// rb_dims writes the extent of dataset path into dims (room for max) and
// returns its rank (0 for a scalar), or -1; -2 when the rank exceeds max.
int rb_dims(hid_t loc, const char *path, hsize_t *dims, int max) {
	hid_t d = H5Dopen2(loc, path, H5P_DEFAULT);
	if (d < 0) { rb_capture(); return -1; }
	hid_t s = H5Dget_space(d);
	if (s < 0) { rb_capture(); H5Dclose(d); return -1; }
	int rank = H5Sget_simple_extent_ndims(s);
	if (rank < 0) { rb_capture(); H5Sclose(s); H5Dclose(d); return -1; }
	if (rank > max) { H5Sclose(s); H5Dclose(d); return -2; }
	if (rank > 0 && H5Sget_simple_extent_dims(s, dims, NULL) < 0) {
		rb_capture(); H5Sclose(s); H5Dclose(d); return -1;
	}
	H5Sclose(s);
	H5Dclose(d);
	return rank;
}

// rb_read reads all n values of dataset path, converted to the memory type
// (0: double, 1: long long), into buf. It fails (-2) when the dataset holds
// another number of values or is not of a numeric class.
int rb_read(hid_t loc, const char *path, int mem, void *buf, unsigned long long n) {
	int rc = -1;
	hid_t d = -1, s = -1, t = -1;
	d = H5Dopen2(loc, path, H5P_DEFAULT);
	if (d < 0) { rb_capture(); goto done; }
	t = H5Dget_type(d);
	if (t < 0) { rb_capture(); goto done; }
	H5T_class_t c = H5Tget_class(t);
	if ((mem == 0 && c != H5T_FLOAT) || (mem == 1 && c != H5T_INTEGER)) { rc = -2; goto done; }
	s = H5Dget_space(d);
	if (s < 0) { rb_capture(); goto done; }
	hssize_t np = H5Sget_simple_extent_npoints(s);
	if (np < 0) { rb_capture(); goto done; }
	if ((unsigned long long)np != n) { rc = -2; goto done; }
	if (n > 0 && H5Dread(d, mem == 0 ? H5T_NATIVE_DOUBLE : H5T_NATIVE_LLONG, H5S_ALL, H5S_ALL, H5P_DEFAULT, buf) < 0) {
		rb_capture();
		goto done;
	}
	rc = 0;
done:
	if (s >= 0) H5Sclose(s);
	if (t >= 0) H5Tclose(t);
	if (d >= 0) H5Dclose(d);
	return rc;
}

int rb_attr_exists(hid_t loc, const char *obj, const char *name) {
	htri_t r = H5Aexists_by_name(loc, obj, name, H5P_DEFAULT);
	if (r < 0) { rb_capture(); return -1; }
	return r > 0;
}

// rb_set_attr writes a scalar attribute name on object obj, replacing one
// of that name. kind: 0 double, 1 signed 64-bit, 2 unsigned 64-bit,
// 3 variable-length UTF-8 string (value points to the char pointer).
int rb_set_attr(hid_t loc, const char *obj, const char *name, int kind, const void *value) {
	int rc = -1;
	hid_t space = -1, ft = -1, mt = -1, a = -1;
	htri_t ex = H5Aexists_by_name(loc, obj, name, H5P_DEFAULT);
	if (ex < 0) { rb_capture(); goto done; }
	if (ex > 0 && H5Adelete_by_name(loc, obj, name, H5P_DEFAULT) < 0) { rb_capture(); goto done; }
	space = H5Screate(H5S_SCALAR);
	if (space < 0) { rb_capture(); goto done; }
	switch (kind) {
	case 0: ft = H5Tcopy(H5T_IEEE_F64LE); mt = H5Tcopy(H5T_NATIVE_DOUBLE); break;
	case 1: ft = H5Tcopy(H5T_STD_I64LE); mt = H5Tcopy(H5T_NATIVE_LLONG); break;
	case 2: ft = H5Tcopy(H5T_STD_U64LE); mt = H5Tcopy(H5T_NATIVE_ULLONG); break;
	default:
		ft = H5Tcopy(H5T_C_S1);
		if (ft < 0 || H5Tset_size(ft, H5T_VARIABLE) < 0 || H5Tset_cset(ft, H5T_CSET_UTF8) < 0) {
			rb_capture();
			goto done;
		}
		mt = H5Tcopy(ft);
	}
	if (ft < 0 || mt < 0) { rb_capture(); goto done; }
	a = H5Acreate_by_name(loc, obj, name, ft, space, H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT);
	if (a < 0) { rb_capture(); goto done; }
	if (H5Awrite(a, mt, value) < 0) { rb_capture(); goto done; }
	if (H5Aclose(a) < 0) { a = -1; rb_capture(); goto done; }
	a = -1;
	rc = 0;
done:
	if (a >= 0) H5Aclose(a);
	if (mt >= 0) H5Tclose(mt);
	if (ft >= 0) H5Tclose(ft);
	if (space >= 0) H5Sclose(space);
	return rc;
}

// rb_get_num reads a one-value numeric attribute converted to kind (0
// double, 1 signed 64-bit, 2 unsigned 64-bit); -2 when it is not a
// one-value number.
int rb_get_num(hid_t loc, const char *obj, const char *name, int kind, void *out) {
	int rc = -1;
	hid_t a = -1, t = -1, s = -1;
	a = H5Aopen_by_name(loc, obj, name, H5P_DEFAULT, H5P_DEFAULT);
	if (a < 0) { rb_capture(); goto done; }
	t = H5Aget_type(a);
	if (t < 0) { rb_capture(); goto done; }
	H5T_class_t c = H5Tget_class(t);
	if (c != H5T_FLOAT && c != H5T_INTEGER) { rc = -2; goto done; }
	s = H5Aget_space(a);
	if (s < 0) { rb_capture(); goto done; }
	if (H5Sget_simple_extent_npoints(s) != 1) { rc = -2; goto done; }
	hid_t mt = kind == 0 ? H5T_NATIVE_DOUBLE : kind == 1 ? H5T_NATIVE_LLONG : H5T_NATIVE_ULLONG;
	if (H5Aread(a, mt, out) < 0) { rb_capture(); goto done; }
	rc = 0;
done:
	if (s >= 0) H5Sclose(s);
	if (t >= 0) H5Tclose(t);
	if (a >= 0) H5Aclose(a);
	return rc;
}

// rb_get_str reads a scalar string attribute (variable or fixed length)
// into a malloc'd string that the caller frees. *bad is set when the
// attribute is not a string.
char *rb_get_str(hid_t loc, const char *obj, const char *name, int *bad) {
	char *out = NULL;
	hid_t a = -1, ft = -1, mt = -1;
	*bad = 0;
	a = H5Aopen_by_name(loc, obj, name, H5P_DEFAULT, H5P_DEFAULT);
	if (a < 0) { rb_capture(); goto done; }
	ft = H5Aget_type(a);
	if (ft < 0) { rb_capture(); goto done; }
	if (H5Tget_class(ft) != H5T_STRING) { *bad = 1; goto done; }
	htri_t vl = H5Tis_variable_str(ft);
	if (vl < 0) { rb_capture(); goto done; }
	mt = H5Tcopy(H5T_C_S1);
	if (mt < 0) { rb_capture(); goto done; }
	if (vl) {
		char *p = NULL;
		if (H5Tset_size(mt, H5T_VARIABLE) < 0 || H5Tset_cset(mt, H5Tget_cset(ft)) < 0 ||
				H5Aread(a, mt, &p) < 0) {
			rb_capture();
			goto done;
		}
		out = strdup(p == NULL ? "" : p);
		if (p != NULL) H5free_memory(p);
	} else {
		size_t n = H5Tget_size(ft);
		if (H5Tset_size(mt, n + 1) < 0 || H5Tset_cset(mt, H5Tget_cset(ft)) < 0) { rb_capture(); goto done; }
		out = calloc(n + 1, 1);
		if (out != NULL && H5Aread(a, mt, out) < 0) {
			rb_capture();
			free(out);
			out = NULL;
		}
	}
done:
	if (mt >= 0) H5Tclose(mt);
	if (ft >= 0) H5Tclose(ft);
	if (a >= 0) H5Aclose(a);
	return out;
}

// rb_make_scale turns dataset path into a dimension scale named name (the
// HDF5 high-level H5DS interface, which netCDF-4 reads as a dimension).
int rb_make_scale(hid_t loc, const char *path, const char *name) {
	hid_t d = H5Dopen2(loc, path, H5P_DEFAULT);
	if (d < 0) { rb_capture(); return -1; }
	if (H5DSset_scale(d, name) < 0) { rb_capture(); H5Dclose(d); return -1; }
	H5Dclose(d);
	return 0;
}

// rb_attach attaches (on != 0) or detaches the dimension scale scale to
// dimension idx of dataset path.
int rb_attach(hid_t loc, const char *path, const char *scale, unsigned idx, int on) {
	int rc = -1;
	hid_t d = -1, s = -1;
	d = H5Dopen2(loc, path, H5P_DEFAULT);
	if (d < 0) { rb_capture(); goto done; }
	s = H5Dopen2(loc, scale, H5P_DEFAULT);
	if (s < 0) { rb_capture(); goto done; }
	if ((on ? H5DSattach_scale(d, s, idx) : H5DSdetach_scale(d, s, idx)) < 0) { rb_capture(); goto done; }
	rc = 0;
done:
	if (s >= 0) H5Dclose(s);
	if (d >= 0) H5Dclose(d);
	return rc;
}

// rb_is_scale reports whether dataset path is a dimension scale.
int rb_is_scale(hid_t loc, const char *path) {
	hid_t d = H5Dopen2(loc, path, H5P_DEFAULT);
	if (d < 0) { rb_capture(); return -1; }
	htri_t r = H5DSis_scale(d);
	if (r < 0) { rb_capture(); }
	H5Dclose(d);
	return r < 0 ? -1 : r > 0;
}

// rb_write_virtual creates the virtual dataset path of rank dimensions
// dims (float64, NaN where no source maps) that stacks n source datasets of
// this file, each of extent dims[1:], along its first dimension: source j
// (named srcs[j]) fills index at[j].
int rb_write_virtual(hid_t loc, const char *path, int rank, const hsize_t *dims,
		int n, const char *const *srcs, const hsize_t *at) {
	int rc = -1;
	hid_t space = -1, src = -1, dcpl = -1, d = -1;
	hsize_t start[8], count[8];
	double fill = 0.0 / 0.0;
	if (rank < 2 || rank > 8) { strcpy(rb_err, "virtual dataset rank out of range"); return -1; }
	space = H5Screate_simple(rank, dims, NULL);
	if (space < 0) { rb_capture(); goto done; }
	src = H5Screate_simple(rank - 1, dims + 1, NULL);
	if (src < 0) { rb_capture(); goto done; }
	dcpl = H5Pcreate(H5P_DATASET_CREATE);
	if (dcpl < 0 || H5Pset_fill_value(dcpl, H5T_NATIVE_DOUBLE, &fill) < 0) { rb_capture(); goto done; }
	for (int i = 0; i < rank; i++) {
		start[i] = 0;
		count[i] = dims[i];
	}
	count[0] = 1;
	for (int j = 0; j < n; j++) {
		start[0] = at[j];
		if (H5Sselect_hyperslab(space, H5S_SELECT_SET, start, NULL, count, NULL) < 0 ||
				H5Pset_virtual(dcpl, space, ".", srcs[j], src) < 0) {
			rb_capture();
			goto done;
		}
	}
	if (H5Sselect_all(space) < 0) { rb_capture(); goto done; }
	d = rb_create_dataset(loc, path, H5T_IEEE_F64LE, space, dcpl);
	if (d < 0) goto done;
	if (H5Dclose(d) < 0) { d = -1; rb_capture(); goto done; }
	d = -1;
	rc = 0;
done:
	if (d >= 0) H5Dclose(d);
	if (dcpl >= 0) H5Pclose(dcpl);
	if (src >= 0) H5Sclose(src);
	if (space >= 0) H5Sclose(space);
	return rc;
}
