/* download.c - one HTTPS download into a file, through libcurl.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <curl/curl.h>
#include <errno.h>
#include <pthread.h>
#include <stdio.h>
#include <string.h>
#include <strings.h>

#include "../common/sha256.h"
#include "fetch_impl.h"

static pthread_once_t curl_once = PTHREAD_ONCE_INIT;
static CURLcode curl_init_rc;

/* curl_global_init is not thread-safe in every libcurl build; once. */
static void init_curl(void) { curl_init_rc = curl_global_init(CURL_GLOBAL_DEFAULT); }

static int is_loopback(const char *host) {
    return strcasecmp(host, "localhost") == 0 || strcmp(host, "::1") == 0 ||
           strcmp(host, "[::1]") == 0 || strncmp(host, "127.", 4) == 0;
}

vg_status vg_fetch_check_url(const char *url, int allow_http, vg_error *err) {
    CURLU *u = curl_url();
    if (!u) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    char *scheme = NULL, *host = NULL;
    vg_status st = VG_OK;
    if (curl_url_set(u, CURLUPART_URL, url, 0) != CURLUE_OK ||
        curl_url_get(u, CURLUPART_SCHEME, &scheme, 0) != CURLUE_OK ||
        curl_url_get(u, CURLUPART_HOST, &host, 0) != CURLUE_OK) {
        st = vg_error_set(err, VG_EINVAL, NULL, 0, "not a valid address: %.200s", url);
    } else if (strcasecmp(scheme, "https") == 0) {
        st = VG_OK;
    } else if (strcasecmp(scheme, "http") == 0 && allow_http && is_loopback(host)) {
        st = VG_OK;
    } else if (strcasecmp(scheme, "http") == 0) {
        st = vg_error_set(err, VG_EINVAL, NULL, 0,
                          "refusing %.200s: downloads use HTTPS only%s", url,
                          allow_http ? " (plain HTTP is allowed for a loopback host only)" : "");
    } else {
        st = vg_error_set(err, VG_EINVAL, NULL, 0, "refusing %.200s: only https:// addresses", url);
    }
    curl_free(scheme);
    curl_free(host);
    curl_url_cleanup(u);
    return st;
}

typedef struct sink {
    FILE *fp;
    vg_sha256 *hash;
    uint64_t bytes, max;
    int too_big, write_failed;
} sink;

static size_t write_cb(char *data, size_t size, size_t n, void *ctx) {
    sink *k = ctx;
    size_t len = size * n;
    /* The limit is checked as bytes arrive: a server need not send a
     * Content-Length, and CURLOPT_MAXFILESIZE cannot stop such a
     * transfer before libcurl 8.4. */
    if (k->bytes + len > k->max) {
        k->too_big = 1;
        return 0;
    }
    if (fwrite(data, 1, len, k->fp) != len) {
        k->write_failed = 1;
        return 0;
    }
    vg_sha256_update(k->hash, data, len);
    k->bytes += len;
    return len;
}

vg_status vg_fetch_download(const char *url, const char *dest, const vg_fetch_options *opt,
                            char sha256[65], uint64_t *bytes, vg_error *err) {
    *bytes = 0;
    vg_status st = vg_fetch_check_url(url, opt->allow_http, err);
    if (st != VG_OK) return st;
    pthread_once(&curl_once, init_curl);
    if (curl_init_rc != CURLE_OK)
        return vg_error_set(err, VG_ENET, NULL, 0, "libcurl could not start: %s",
                            curl_easy_strerror(curl_init_rc));
    sink k = {NULL, NULL, 0, opt->max_bytes ? opt->max_bytes : VG_FETCH_MAX_BYTES, 0, 0};
    k.fp = fopen(dest, "wbx");
    if (!k.fp) return vg_error_set(err, VG_EIO, dest, 0, "cannot create");
    k.hash = vg_sha256_new();
    CURL *c = curl_easy_init();
    if (!k.hash || !c) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    char errbuf[CURL_ERROR_SIZE] = "";
    long timeout = opt->timeout > 0 ? opt->timeout : 60;
    curl_easy_setopt(c, CURLOPT_URL, url);
    /* Only the schemes vg_fetch_check_url accepted, also after redirects;
     * with plain HTTP allowed (a loopback test server) no redirect is
     * followed at all, so it cannot lead anywhere else. */
    curl_easy_setopt(c, CURLOPT_PROTOCOLS_STR, opt->allow_http ? "http,https" : "https");
    curl_easy_setopt(c, CURLOPT_REDIR_PROTOCOLS_STR, "https");
    curl_easy_setopt(c, CURLOPT_FOLLOWLOCATION, opt->allow_http ? 0L : 1L);
    curl_easy_setopt(c, CURLOPT_MAXREDIRS, 5L);
    /* TLS verification is never turned off. */
    curl_easy_setopt(c, CURLOPT_SSL_VERIFYPEER, 1L);
    curl_easy_setopt(c, CURLOPT_SSL_VERIFYHOST, 2L);
    curl_easy_setopt(c, CURLOPT_FAILONERROR, 1L);
    /* This machine is never reached through a proxy from the environment. */
    curl_easy_setopt(c, CURLOPT_NOPROXY, "localhost,127.0.0.1,::1");
    curl_easy_setopt(c, CURLOPT_NOSIGNAL, 1L);
    curl_easy_setopt(c, CURLOPT_CONNECTTIMEOUT, 30L);
    curl_easy_setopt(c, CURLOPT_LOW_SPEED_LIMIT, 1L);
    curl_easy_setopt(c, CURLOPT_LOW_SPEED_TIME, timeout);
    curl_easy_setopt(c, CURLOPT_MAXFILESIZE_LARGE, (curl_off_t)k.max);
    curl_easy_setopt(c, CURLOPT_USERAGENT, "vecgauge/" VG_VERSION_STRING);
    curl_easy_setopt(c, CURLOPT_ERRORBUFFER, errbuf);
    curl_easy_setopt(c, CURLOPT_WRITEFUNCTION, write_cb);
    curl_easy_setopt(c, CURLOPT_WRITEDATA, &k);
    CURLcode rc = curl_easy_perform(c);
    if (rc == CURLE_OK && fflush(k.fp) != 0) k.write_failed = 1;
    if (k.too_big || rc == CURLE_FILESIZE_EXCEEDED) {
        st = vg_error_set(err, VG_ELIMIT, NULL, 0,
                          "%.200s is larger than the limit of %llu bytes", url,
                          (unsigned long long)k.max);
    } else if (k.write_failed) {
        st = vg_error_set(err, VG_EIO, dest, 0, "cannot write the download");
    } else if (rc != CURLE_OK) {
        st = vg_error_set(err, VG_ENET, NULL, 0, "download of %.200s failed: %s", url,
                          *errbuf ? errbuf : curl_easy_strerror(rc));
    }
    *bytes = k.bytes;
done:
    if (c) curl_easy_cleanup(c);
    if (k.hash) {
        if (st == VG_OK)
            vg_sha256_final(k.hash, sha256);
        else
            vg_sha256_free(k.hash);
    }
    if (fclose(k.fp) != 0 && st == VG_OK) st = vg_error_set(err, VG_EIO, dest, 0, "cannot write the download");
    return st;
}
