/* vg_config.h - build-time settings of libvecgauge, each with its default.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every setting can be overridden with -D on the compiler command line.
 * Nothing here changes the library's ABI except where a comment says so.
 */
#ifndef VG_CONFIG_H
#define VG_CONFIG_H

/* Version of the library and the tool. vg_version() returns the same
 * string at run time; a test checks that the two agree. */
#define VG_VERSION_MAJOR 0
#define VG_VERSION_MINOR 1
#define VG_VERSION_PATCH 0
#define VG_VERSION_STRING "0.1.0"
/* One number that grows with every release: MAJOR*10000+MINOR*100+PATCH. */
#define VG_VERSION_NUMBER 100

/* Symbol visibility. The shared library is built with -fvisibility=hidden;
 * only declarations marked VG_API are exported. */
#ifndef VG_API
#if defined(__GNUC__) && __GNUC__ >= 4
#define VG_API __attribute__((visibility("default")))
#else
#define VG_API
#endif
#endif

/* printf-style format checking where the compiler supports it. */
#if defined(__GNUC__)
#define VG_PRINTF(fmt, args) __attribute__((format(printf, fmt, args)))
#else
#define VG_PRINTF(fmt, args)
#endif

/* Default number of bootstrap replicates (--bootstrap). */
#ifndef VG_DEFAULT_BOOTSTRAP
#define VG_DEFAULT_BOOTSTRAP 2000
#endif

/* Default random seed (--seed). Any fixed value works; this one is the
 * digits of pi after the point, chosen so that it is obviously arbitrary. */
#ifndef VG_DEFAULT_SEED
#define VG_DEFAULT_SEED 14159265u
#endif

/* Default confidence level of every interval (--ci). */
#ifndef VG_DEFAULT_CI
#define VG_DEFAULT_CI 0.95
#endif

/* Default size of the analogy candidate vocabulary (--analogy-vocab):
 * the first N rows of a vector set (common practice). 0 means every row. */
#ifndef VG_DEFAULT_ANALOGY_VOCAB
#define VG_DEFAULT_ANALOGY_VOCAB 300000u
#endif

/* Coverage below this fraction is flagged in the summary. */
#ifndef VG_COVERAGE_WARN
#define VG_COVERAGE_WARN 0.90
#endif

/* Longest line any text reader accepts, in bytes. Longer lines are an
 * error rather than an unbounded allocation. 16 MiB holds a 300-dim row
 * many times over and a 100k-dim row at 160 bytes per value. */
#ifndef VG_MAX_LINE
#define VG_MAX_LINE (16u * 1024u * 1024u)
#endif

/* Longest word, in bytes, accepted in a vector file or a suite. */
#ifndef VG_MAX_WORD
#define VG_MAX_WORD 4096u
#endif

/* Largest size a suite file (word pairs, analogies, a relation file) may
 * have once decompressed, by default (vg_suite_set_max_bytes changes it).
 * The largest public suite file is under 1 MB; a 1.5 MB gzip file can
 * inflate to gigabytes of pairs, each held in memory. */
#ifndef VG_MAX_SUITE_BYTES
#define VG_MAX_SUITE_BYTES (64u * 1024u * 1024u)
#endif

/* A gzip vector file may inflate to this many times its stored size (or
 * to VG_INFLATE_FLOOR, whichever is larger) by default; the loader's
 * max_inflate option changes it. Real vector files compress three to
 * five times; a file made to inflate 1000 times is a bomb. */
#ifndef VG_MAX_INFLATE
#define VG_MAX_INFLATE 64u
#endif
#ifndef VG_INFLATE_FLOOR
#define VG_INFLATE_FLOOR (256ull * 1024u * 1024u)
#endif

/* Largest dimension accepted in a vector file header. */
#ifndef VG_MAX_DIMS
#define VG_MAX_DIMS 100000u
#endif

/* Size of the fixed text buffers inside vg_error (path and message).
 * Part of the ABI: vg_error embeds them. */
#define VG_ERROR_PATH_MAX 512
#define VG_ERROR_MSG_MAX 512

#endif /* VG_CONFIG_H */
