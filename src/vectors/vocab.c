/* vocab.c - the vocabulary beside a matrix file: one word per line.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Line i is the word of matrix row i, taken whole: it may hold spaces.
 * A UTF-8 byte order mark, "\r\n" endings and trailing blanks are dropped
 * (no word ends in a blank); blank lines at the very end are ignored, but
 * a blank line before the last word is an error, since it would shift
 * every later word onto the wrong row.
 */
#include <string.h>
#include <sys/stat.h>

#include "../common/alloc.h"
#include "vectors_impl.h"

static int exists(const char *path) {
    struct stat sb;
    return stat(path, &sb) == 0 && !S_ISDIR(sb.st_mode);
}

/* The candidates beside vectors_path: its stem (the name without
 * ".npy" or ".npy.gz") with ".vocab", ".txt", ".vocab.gz", ".txt.gz". */
static int find_beside(const char *vectors_path, char *out, size_t size, char *tried, size_t tsize) {
    size_t n = strlen(vectors_path);
    size_t stem = n;
    if (n > 7 && strcmp(vectors_path + n - 7, ".npy.gz") == 0) {
        stem = n - 7;
    } else if (n > 4 && strcmp(vectors_path + n - 4, ".npy") == 0) {
        stem = n - 4;
    } else {
        const char *slash = strrchr(vectors_path, '/');
        const char *dot = strrchr(vectors_path, '.');
        if (dot && (!slash || dot > slash)) stem = (size_t)(dot - vectors_path);
    }
    static const char *const ext[] = {".vocab", ".txt", ".vocab.gz", ".txt.gz"};
    tried[0] = '\0';
    for (size_t i = 0; i < sizeof ext / sizeof ext[0]; i++) {
        snprintf(out, size, "%.*s%s", (int)stem, vectors_path, ext[i]);
        if (exists(out)) return 1;
        if (i < 2) {
            size_t tl = strlen(tried);
            snprintf(tried + tl, tsize - tl, "%s%s", tl ? " and " : "", out);
        }
    }
    return 0;
}

/* Room for n words in the two lists: address space that grows by mremap
 * (no copying) and is backed only where written, so a reservation from
 * the file's size costs nothing. */
static int reserve_words(vg_vocab *vc, size_t n) {
    size_t wb, lb;
    if (vg_mul_overflow(n, sizeof *vc->words, &wb) || vg_mul_overflow(n, sizeof *vc->lens, &lb) ||
        vg_bigbuf_reserve(&vc->words_buf, wb) != 0 || vg_bigbuf_reserve(&vc->lens_buf, lb) != 0)
        return -1;
    vc->words = vc->words_buf.p;
    vc->lens = vc->lens_buf.p;
    return 0;
}

static int push_word(vg_vocab *vc, size_t *cap, const char *w, size_t len) {
    if (vc->n == *cap) {
        size_t want = *cap ? *cap : 4096;
        if (vg_mul_overflow(want, 2, &want) || reserve_words(vc, want) != 0) return -1;
        *cap = want;
    }
    char *s = vg_arena_strndup(&vc->arena, w, len);
    if (!s) return -1;
    vc->words[vc->n] = s;
    vc->lens[vc->n] = (uint32_t)len;
    vc->n++;
    return 0;
}

vg_status vg_vocab_read(const char *explicit_path, const char *vectors_path, size_t max_words,
                        int hash, vg_vocab *vc, vg_error *err) {
    memset(vc, 0, sizeof *vc);
    char found[VG_ERROR_PATH_MAX], tried[2 * VG_ERROR_PATH_MAX];
    const char *path = explicit_path;
    if (!path) {
        if (!find_beside(vectors_path, found, sizeof found, tried, sizeof tried))
            return vg_error_set(err, VG_ENOTFOUND, vectors_path, 0,
                                "no vocabulary file beside the matrix (looked for %s); give one "
                                "with --vocab FILE",
                                tried);
        path = found;
    }
    snprintf(vc->path, sizeof vc->path, "%s", path);
    vg_src *src = NULL;
    vg_status st = vg_src_open(path, hash, NULL, NULL, &src, err);
    if (st != VG_OK) return st;
    vg_src_limit_inflate(src, VG_MAX_INFLATE);
    size_t cap = 0;
    /* A plain file of S bytes holds at most S / 2 + 1 words (a byte and a
     * newline each): reserve that once and the lists never move. */
    if (!vg_src_gzip(src) && vg_src_stream_bound(src) > 0) {
        uint64_t most = vg_src_stream_bound(src) / 2 + 1;
        if (max_words && most > max_words) most = max_words;
        if (most <= SIZE_MAX / sizeof(void *) && reserve_words(vc, (size_t)most) == 0)
            cap = (size_t)most;
    }
    st = vg_src_start(src, 1, 0, err);
    uint64_t line = 0, blank_at = 0;
    vg_chunk c;
    int rc = 0;
    while (st == VG_OK && (rc = vg_src_next(src, &c, err)) > 0) {
        const char *p = c.data, *end = p + c.len;
        if (c.offset == 0 && c.len >= 3 && memcmp(p, "\xEF\xBB\xBF", 3) == 0) p += 3;
        while (p < end && st == VG_OK) {
            if (max_words && vc->n >= max_words) break;
            const char *nl = memchr(p, '\n', (size_t)(end - p));
            const char *le = nl ? nl : end;
            line++;
            while (le > p && (le[-1] == '\r' || le[-1] == ' ' || le[-1] == '\t')) le--;
            size_t len = (size_t)(le - p);
            if (len == 0) {
                if (!blank_at) blank_at = line;
            } else if (blank_at) {
                st = vg_error_set(err, VG_EFORMAT, path, blank_at,
                                  "blank line in the vocabulary: expected one word per line "
                                  "(every later word would be on the wrong row)");
            } else if (len > VG_MAX_WORD) {
                st = vg_error_set(err, VG_ELIMIT, path, line, "word of %zu bytes exceeds the limit of %u",
                                  len, (unsigned)VG_MAX_WORD);
            } else if (push_word(vc, &cap, p, len) != 0) {
                st = vg_error_set(err, VG_ENOMEM, path, line, "out of memory reading the vocabulary");
            }
            p = nl ? nl + 1 : end;
        }
        if (st == VG_OK) st = vg_src_release(src, &c, err);
        if (max_words && vc->n >= max_words) break;
    }
    if (st == VG_OK && rc < 0) st = err->code;
    if (st == VG_OK) st = vg_src_finish(src, err);
    if (st == VG_OK && hash) {
        snprintf(vc->sha256, sizeof vc->sha256, "%s", vg_src_sha256(src));
        vc->hashed = 1;
    }
    vg_src_close(src);
    if (st != VG_OK) vg_vocab_free(vc);
    return st;
}

void vg_vocab_free(vg_vocab *vc) {
    vg_bigbuf_free(&vc->words_buf);
    vg_bigbuf_free(&vc->lens_buf);
    vg_arena_free(&vc->arena);
    vc->words = NULL;
    vc->lens = NULL;
    vc->n = 0;
}
