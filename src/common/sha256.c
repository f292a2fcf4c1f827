/* sha256.c - SHA-256 through OpenSSL's EVP interface.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * libcrypto rather than a hand-written SHA-256: it is audited, uses the
 * CPU's SHA extensions where present, and every Debian system has it.
 */
#include "sha256.h"

#include "vecgauge/vecgauge.h"

#include <errno.h>
#include <openssl/evp.h>
#include <stdio.h>
#include <unistd.h>

#include "infile.h"

struct vg_sha256 {
    EVP_MD_CTX *ctx;
};

vg_sha256 *vg_sha256_new(void) {
    EVP_MD_CTX *ctx = EVP_MD_CTX_new();
    if (!ctx) return NULL;
    if (EVP_DigestInit_ex(ctx, EVP_sha256(), NULL) != 1) {
        EVP_MD_CTX_free(ctx);
        return NULL;
    }
    /* The context pointer is the whole state; store it in the handle
     * itself so that no second allocation can fail. */
    return (vg_sha256 *)ctx;
}

void vg_sha256_update(vg_sha256 *h, const void *data, size_t n) {
    if (h && n) EVP_DigestUpdate((EVP_MD_CTX *)h, data, n);
}

static void to_hex(const unsigned char *md, unsigned len, char hex[65]) {
    static const char digits[] = "0123456789abcdef";
    for (unsigned i = 0; i < len && i < 32; i++) {
        hex[2 * i] = digits[md[i] >> 4];
        hex[2 * i + 1] = digits[md[i] & 15];
    }
    hex[64] = '\0';
}

void vg_sha256_final(vg_sha256 *h, char hex[65]) {
    unsigned char md[EVP_MAX_MD_SIZE];
    unsigned len = 0;
    hex[0] = '\0';
    if (!h) return;
    if (EVP_DigestFinal_ex((EVP_MD_CTX *)h, md, &len) == 1) to_hex(md, len, hex);
    EVP_MD_CTX_free((EVP_MD_CTX *)h);
}

void vg_sha256_free(vg_sha256 *h) {
    if (h) EVP_MD_CTX_free((EVP_MD_CTX *)h);
}

void vg_sha256_buffer(const void *data, size_t n, char hex[65]) {
    unsigned char md[EVP_MAX_MD_SIZE];
    unsigned len = 0;
    hex[0] = '\0';
    if (EVP_Digest(data, n, md, &len, EVP_sha256(), NULL) == 1) to_hex(md, len, hex);
}

vg_status vg_sha256_file(const char *path, char hex[65], uint64_t *bytes, vg_error *err) {
    /* Through vg_infile_open: a device or a FIFO nobody writes to is an
     * error, not a hang. */
    int fd;
    vg_status st = vg_infile_open(path, VG_IN_PIPE, &fd, NULL, err);
    if (st != VG_OK) return st;
    FILE *fp = fdopen(fd, "rb");
    if (!fp) {
        close(fd);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening for hashing");
    }
    vg_sha256 *h = vg_sha256_new();
    if (!h) {
        fclose(fp);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory starting sha256");
    }
    unsigned char buf[1 << 16];
    uint64_t total = 0;
    size_t n;
    while ((n = fread(buf, 1, sizeof buf, fp)) > 0) {
        vg_sha256_update(h, buf, n);
        total += n;
    }
    int bad = ferror(fp);
    fclose(fp);
    if (bad) {
        vg_sha256_free(h);
        return vg_error_set(err, VG_EIO, path, 0, "read failed while hashing");
    }
    vg_sha256_final(h, hex);
    if (bytes) *bytes = total;
    return VG_OK;
}

vg_status vg_file_sha256(const char *path, char hex[65], uint64_t *bytes, vg_error *err) {
    return vg_sha256_file(path, hex, bytes, err);
}
