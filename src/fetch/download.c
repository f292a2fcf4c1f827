/* download.c - one HTTPS download into a file, through libcurl.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <arpa/inet.h>
#include <curl/curl.h>
#include <netinet/in.h>
#include <time.h>
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

/* A loopback host: "localhost" (which libcurl resolves to the loopback
 * addresses itself), or an address literal, parsed, in 127.0.0.0/8 or ::1
 * (or ::ffff:127.x.y.z). A name such as 127.0.0.1.example.net is not an
 * address and is refused: whoever owns the domain decides where it goes. */
static int is_loopback(const char *host) {
    if (strcasecmp(host, "localhost") == 0) return 1;
    char h[64];
    size_t n = strlen(host);
    if (n >= 2 && host[0] == '[' && host[n - 1] == ']') {
        host++;
        n -= 2;
    }
    if (n >= sizeof h) return 0;
    memcpy(h, host, n);
    h[n] = '\0';
    struct in_addr a4;
    struct in6_addr a6;
    if (inet_pton(AF_INET, h, &a4) == 1) return (ntohl(a4.s_addr) >> 24) == 127;
    if (inet_pton(AF_INET6, h, &a6) == 1)
        return IN6_IS_ADDR_LOOPBACK(&a6) || (IN6_IS_ADDR_V4MAPPED(&a6) && a6.s6_addr[12] == 127);
    return 0;
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
    int too_big, write_failed, stalled;
    double *last;       /* when bytes last arrived, shared by every address */
    double timeout;
    curl_off_t seen;    /* bytes received when last checked */
} sink;

static double now_s(void) {
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + (double)t.tv_nsec * 1e-9;
}

/* libcurl calls this about once a second, also while nothing arrives: the
 * time without progress is counted from the last byte received for this
 * suite, whichever address sent it, so --timeout bounds the whole wait on
 * a stalled server, not each address tried. */
static int progress_cb(void *ctx, curl_off_t dltotal, curl_off_t dlnow, curl_off_t ultotal,
                       curl_off_t ulnow) {
    (void)dltotal;
    (void)ultotal;
    (void)ulnow;
    sink *k = ctx;
    double t = now_s();
    if (dlnow > k->seen) {
        k->seen = dlnow;
        *k->last = t;
    }
    if (t - *k->last > k->timeout) {
        k->stalled = 1;
        return 1;
    }
    return 0;
}

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
                            double *last_progress, char sha256[65], uint64_t *bytes,
                            vg_error *err) {
    *bytes = 0;
    vg_status st = vg_fetch_check_url(url, opt->allow_http, err);
    if (st != VG_OK) return st;
    pthread_once(&curl_once, init_curl);
    if (curl_init_rc != CURLE_OK)
        return vg_error_set(err, VG_ENET, NULL, 0, "libcurl could not start: %s",
                            curl_easy_strerror(curl_init_rc));
    long timeout = opt->timeout > 0 ? opt->timeout : 60;
    sink k = {NULL, NULL, 0, opt->max_bytes ? opt->max_bytes : VG_FETCH_MAX_BYTES, 0, 0, 0,
              last_progress, (double)timeout, 0};
    double left = (double)timeout - (now_s() - *last_progress);
    if (left <= 0)
        return vg_error_set(err, VG_ENET, NULL, 0,
                            "download of %.200s not tried: no data for %ld s from the addresses "
                            "before it (--timeout)",
                            url, timeout);
    k.fp = fopen(dest, "wbx");
    if (!k.fp) return vg_error_set(err, VG_EIO, dest, 0, "cannot create");
    k.hash = vg_sha256_new();
    CURL *c = curl_easy_init();
    if (!k.hash || !c) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    char errbuf[CURL_ERROR_SIZE] = "";
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
    /* The connection gets what is left of the time without progress. */
    curl_easy_setopt(c, CURLOPT_CONNECTTIMEOUT_MS, (long)(left * 1000) + 1);
    curl_easy_setopt(c, CURLOPT_NOPROGRESS, 0L);
    curl_easy_setopt(c, CURLOPT_XFERINFOFUNCTION, progress_cb);
    curl_easy_setopt(c, CURLOPT_XFERINFODATA, &k);
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
    } else if (k.stalled || rc == CURLE_OPERATION_TIMEDOUT) {
        st = vg_error_set(err, VG_ENET, NULL, 0,
                          "download of %.200s failed: no data for %ld s (--timeout)", url, timeout);
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
