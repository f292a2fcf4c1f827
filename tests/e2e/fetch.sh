#!/usr/bin/env bash
# fetch.sh - `vecgauge fetch` against a local HTTP server on 127.0.0.1
# (python3's http.server), serving archives built here at test time: good
# .zip/.tar.gz/plain files, a tampered archive (rejected on its sha256),
# archives with a '..' member, an absolute member and a link (refused), an
# HTML page instead of the data (refused: it does not read as the suite).
# No test needs the internet. Digests pinned in the test manifest come
# from sha256sum (GNU coreutils) over the good files.
source "$(dirname "$0")/lib.bash"

SRV="$TMP/srv" DATA="$TMP/data"
mkdir -p "$SRV"

# Fixture archives, built with python3's zipfile and tarfile.
"$PY" - "$SRV" <<'PYEOF'
import io, os, sys, tarfile, zipfile
srv = sys.argv[1]
alpha = b"alpha\tbeta\t3.5\nalpha\tgamma\t9\nbeta\tgamma\t6\nalpha\tdelta\t1\n"
def tar(name, members):
    with tarfile.open(os.path.join(srv, name), "w:gz") as t:
        for n, data, kind in members:
            ti = tarfile.TarInfo(n)
            if kind == "link":
                ti.type = tarfile.SYMTYPE
                ti.linkname = "/etc/passwd"
                t.addfile(ti)
            else:
                ti.size = len(data)
                t.addfile(ti, io.BytesIO(data))
def zipf(name, members):
    with zipfile.ZipFile(os.path.join(srv, name), "w") as z:
        for n, data in members:
            z.writestr(n, data)
open(os.path.join(srv, "alpha.tsv"), "wb").write(alpha)
zipf("good.zip", [("pack/README.txt", b"documentation\n"), ("pack/alpha.tsv", alpha)])
zipf("tampered.zip", [("pack/alpha.tsv", alpha.replace(b"9", b"8"))])
zipf("traversal.zip", [("pack/alpha.tsv", alpha), ("../evil.tsv", alpha)])
tar("good.tar.gz", [("pack/alpha.tsv", alpha, "file")])
tar("absolute.tar.gz", [("pack/alpha.tsv", alpha, "file"), ("/tmp/vg-evil-absolute.tsv", alpha, "file")])
tar("link.tar.gz", [("pack/alpha.tsv", b"", "link")])
tar("relations.tar.gz", [("REL/1_group/R01 [x - y].txt", b"cat\tcats\ndog\tdogs\n", "file"),
                         ("REL/2_group/R02 [p - q].txt", b"go\twent\nsee\tsaw\n", "file")])
open(os.path.join(srv, "page.html"), "wb").write(b"<html><body>Not here</body></html>\n")
open(os.path.join(srv, "big.tsv"), "wb").write(alpha * 100)
# Issue 29: a small gzip file inflating to 2 MB of pairs, and a split
# analogy suite (questions and answers) in one archive.
import gzip
open(os.path.join(srv, "bomb.tsv.gz"), "wb").write(gzip.compress(alpha * 50000, 9))
zipf("split.zip", [("msr/q.questions", b"a b c\ne f g\n"), ("msr/q.answers", b"d\nh\n")])
PYEOF

# The server: binds port 0, writes the port it got, serves $SRV.
"$PY" - "$SRV" "$TMP/port" > "$TMP/server.log" 2>&1 <<'PYEOF' &
import functools, http.server, os, sys
handler = functools.partial(http.server.SimpleHTTPRequestHandler, directory=sys.argv[1])
httpd = http.server.ThreadingHTTPServer(("127.0.0.1", 0), handler)
with open(sys.argv[2] + ".tmp", "w") as f:
    f.write(str(httpd.server_address[1]))
os.rename(sys.argv[2] + ".tmp", sys.argv[2])
httpd.serve_forever()
PYEOF
SERVER_PID=$!
trap 'kill "$SERVER_PID" 2>/dev/null; wait "$SERVER_PID" 2>/dev/null; rm -rf "$TMP"' EXIT
for _ in $(seq 1 100); do [ -s "$TMP/port" ] && break; sleep 0.1; done
if [ ! -s "$TMP/port" ]; then
    skip "the local HTTP server (python3 http.server) did not start: $(head -c 200 "$TMP/server.log")"
    done_testing; exit 0
fi
PORT=$(cat "$TMP/port")
U="http://127.0.0.1:$PORT"
A=$(sha256sum "$SRV/alpha.tsv" | cut -d' ' -f1)
Z=$(sha256sum "$SRV/good.zip" | cut -d' ' -f1)
BAD=0000000000000000000000000000000000000000000000000000000000000000

cat > "$TMP/m.csv" <<EOF
id,variant,task,files,url,members,sha256,download_sha256,analogy_layout,notes
zipped,v,similarity,alpha.tsv,$U/good.zip,pack/alpha.tsv,$A,$Z,,
tarred,v,similarity,alpha.tsv,$U/good.tar.gz,pack/alpha.tsv,$A,,,
plain,v,similarity,alpha.tsv,$U/alpha.tsv,,,,,
tampered,v,similarity,alpha.tsv,$U/tampered.zip,pack/alpha.tsv,$A,,,
traversal,v,similarity,alpha.tsv,$U/traversal.zip,pack/alpha.tsv,$A,,,
absolute,v,similarity,alpha.tsv,$U/absolute.tar.gz,pack/alpha.tsv,$A,,,
linked,v,similarity,alpha.tsv,$U/link.tar.gz,pack/alpha.tsv,,,,
htmlpage,v,similarity,alpha.tsv,$U/page.html,,,,,
big,v,similarity,alpha.tsv,$U/big.tsv,,,,,
missing,v,similarity,alpha.tsv,$U/no-such-file.zip,pack/alpha.tsv,$A,,,
dlhash,v,similarity,alpha.tsv,$U/good.zip,pack/alpha.tsv,,$BAD,,
fallback,first,similarity,alpha.tsv,$U/gone.tsv,,$A,,,
fallback,second,,alpha.tsv,$U/alpha.tsv,,$A,,,
nomember,v,similarity,alpha.tsv,$U/good.zip,pack/absent.tsv,,,,
relations,v,analogy,REL/,$U/relations.tar.gz,REL/,,,relation,
faraway,v,similarity,alpha.tsv,http://example.invalid/alpha.tsv,,,,,
prefixed,v,similarity,alpha.tsv,http://127.0.0.1.example.invalid:$PORT/alpha.tsv,,,,,
bomb,v,similarity,alpha.tsv,$U/bomb.tsv.gz,,,,,
split,v,analogy,q.questions;q.answers,$U/split.zip,msr/q.questions;msr/q.answers,,,split,
EOF
F=( "$VG_BIN" fetch --manifest "$TMP/m.csv" --data "$DATA" )

# fetch-1: plain HTTP is refused without --allow-http; the message names
# the address and the exact path to put the file at by hand.
expect_status "fetch-1 http refused without --allow-http: exit 1" 1 "${F[@]}" zipped
expect_in "fetch-1 says HTTPS only" "HTTPS only" "$TMP/err"
expect_in "fetch-1 names the path for a download by hand" "put it at $DATA/zipped/alpha.tsv" "$TMP/err"
expect_in "fetch-1 names the archive member to take" "take pack/alpha.tsv out of it" "$TMP/err"

# fetch-2: --allow-http accepts only loopback hosts (no network is used).
expect_status "fetch-2 non-loopback http refused even with --allow-http" 1 "${F[@]}" --allow-http faraway
expect_in "fetch-2 says why" "loopback" "$TMP/err"

# fetch-3: a member of a .zip, download and member digests pinned.
expect_status "fetch-3 zip member installed: exit 0" 0 "${F[@]}" --allow-http zipped
check "fetch-3 installed file is the archive member byte for byte" cmp "$SRV/alpha.tsv" "$DATA/zipped/alpha.tsv"
expect_in "fetch-3 reports the pinned digest matched" "sha256 matches the manifest" "$TMP/out"
expect_in "fetch-3 record lists the file and its digest" "alpha.tsv,$A" "$DATA/zipped/vecgauge-fetch.csv"
check "fetch-3 README beside the member is not installed" test ! -e "$DATA/zipped/README.txt"
expect_status "fetch-3 a second fetch: exit 0" 0 "${F[@]}" --allow-http zipped
expect_in "fetch-3 a second fetch finds it present" "already present" "$TMP/out"

# fetch-4: a member of a .tar.gz.
expect_status "fetch-4 tar.gz member installed: exit 0" 0 "${F[@]}" --allow-http tarred
check "fetch-4 installed file equals the member" cmp "$SRV/alpha.tsv" "$DATA/tarred/alpha.tsv"

# fetch-5: a file with no pinned digest: installed, digest recorded as first seen.
expect_status "fetch-5 unpinned plain file installed: exit 0" 0 "${F[@]}" --allow-http plain
expect_in "fetch-5 says first seen" "first seen" "$TMP/err"
expect_in "fetch-5 shows the digest seen" "$A" "$TMP/err"
expect_in "fetch-5 record says not pinned" "alpha.tsv,$A,$(wc -c < "$SRV/alpha.tsv"),no," "$DATA/plain/vecgauge-fetch.csv"

# fetch-6: a tampered archive is rejected on the member's digest; nothing installed.
expect_status "fetch-6 tampered archive rejected: exit 1" 1 "${F[@]}" --allow-http tampered
expect_in "fetch-6 names the digest mismatch" "but the manifest pins $A" "$TMP/err"
check "fetch-6 nothing installed" test ! -e "$DATA/tampered/alpha.tsv"

# fetch-7: a '..' member, an absolute member and a link are refused, and
# nothing is written outside the data directory.
expect_status "fetch-7 '..' member refused: exit 1" 1 "${F[@]}" --allow-http traversal
expect_in "fetch-7 says the path leaves the target" "leaves the target" "$TMP/err"
check "fetch-7 no file written beside the data directory" test ! -e "$TMP/evil.tsv"
check "fetch-7 nothing installed" test ! -e "$DATA/traversal/alpha.tsv"
expect_status "fetch-7 absolute member refused: exit 1" 1 "${F[@]}" --allow-http absolute
expect_in "fetch-7 absolute member named" "/tmp/vg-evil-absolute.tsv" "$TMP/err"
check "fetch-7 absolute path not written" test ! -e /tmp/vg-evil-absolute.tsv
expect_status "fetch-7 link member refused: exit 1" 1 "${F[@]}" --allow-http linked
expect_in "fetch-7 says links are refused" "links are refused" "$TMP/err"

# fetch-8: an HTML page where data was expected is not installed.
expect_status "fetch-8 HTML page refused: exit 1" 1 "${F[@]}" --allow-http htmlpage
expect_in "fetch-8 says the files do not read as the suite" "do not read as suite htmlpage" "$TMP/err"
check "fetch-8 nothing installed" test ! -e "$DATA/htmlpage/alpha.tsv"

# fetch-9: the size limit.
expect_status "fetch-9 download over --max-bytes refused: exit 1" 1 "${F[@]}" --allow-http --max-bytes 1000 big
expect_in "fetch-9 names the limit" "larger than the limit of 1000 bytes" "$TMP/err"

# fetch-10: a failed download (HTTP 404) names the address and where the file goes.
expect_status "fetch-10 404: exit 1" 1 "${F[@]}" --allow-http missing
expect_in "fetch-10 names the address that failed" "$U/no-such-file.zip" "$TMP/err"
expect_in "fetch-10 names the path for a download by hand" "$DATA/missing/alpha.tsv" "$TMP/err"

# fetch-11: a pinned digest of the download itself that differs.
expect_status "fetch-11 download digest mismatch: exit 1" 1 "${F[@]}" --allow-http dlhash
expect_in "fetch-11 names the download's digest" "$Z" "$TMP/err"

# fetch-12: when the first known address fails, the next one is tried.
expect_status "fetch-12 falls back to the second address: exit 0" 0 "${F[@]}" --allow-http fallback
expect_in "fetch-12 notes the first failure" "$U/gone.tsv" "$TMP/err"
expect_in "fetch-12 installs the second copy" "(second," "$TMP/out"

# fetch-13: a member missing from the archive.
expect_status "fetch-13 missing member: exit 1" 1 "${F[@]}" --allow-http nomember
expect_in "fetch-13 names the member" "has no member 'pack/absent.tsv'" "$TMP/err"

# fetch-14: a folder of relation files out of a .tar.gz, read as one suite.
expect_status "fetch-14 folder member installed: exit 0" 0 "${F[@]}" --allow-http relations
check "fetch-14 relation files in place" test -f "$DATA/relations/REL/1_group/R01 [x - y].txt"
expect_status "fetch-14 suites lists it present" 0 "$VG_BIN" suites --manifest "$TMP/m.csv" --data "$DATA" relations
expect_in "fetch-14 with 4 questions (2 files of 2 lines)" "4 items" "$TMP/out"

# fetch-15: no staging directory is left behind, whatever failed.
if [ -z "$(find "$DATA" -maxdepth 1 -name '.fetch-*')" ]; then ok "fetch-15 no staging directories left"; else
    not_ok "fetch-15 staging directories left: $(ls -a "$DATA")"; fi

# fetch-16: a fetched suite is scored through the manifest.
expect_status "fetch-16 score --suite on the fetched copy: exit 0" 0 "$VG_BIN" score --manifest "$TMP/m.csv" --data "$DATA" --suite zipped --out "$TMP/run" "$VG_FIXTURES/vectors/header.txt"
expect_in "fetch-16 scores.csv has the suite" "zipped" "$TMP/run/scores.csv"

# fetch-18: TLS verification is always on: an HTTPS server on 127.0.0.1
# with a self-signed certificate (made with the openssl tool) is refused.
if command -v openssl > /dev/null 2>&1 &&
   openssl req -x509 -newkey rsa:2048 -nodes -subj "/CN=127.0.0.1" -days 1 \
       -keyout "$TMP/key.pem" -out "$TMP/cert.pem" > "$TMP/openssl.log" 2>&1; then
    "$PY" - "$SRV" "$TMP/tlsport" "$TMP/cert.pem" "$TMP/key.pem" > "$TMP/tls.log" 2>&1 <<'PYEOF' &
import functools, http.server, os, ssl, sys
handler = functools.partial(http.server.SimpleHTTPRequestHandler, directory=sys.argv[1])
httpd = http.server.ThreadingHTTPServer(("127.0.0.1", 0), handler)
ctx = ssl.SSLContext(ssl.PROTOCOL_TLS_SERVER)
ctx.load_cert_chain(sys.argv[3], sys.argv[4])
httpd.socket = ctx.wrap_socket(httpd.socket, server_side=True)
with open(sys.argv[2] + ".tmp", "w") as f:
    f.write(str(httpd.server_address[1]))
os.rename(sys.argv[2] + ".tmp", sys.argv[2])
httpd.serve_forever()
PYEOF
    TLS_PID=$!
    for _ in $(seq 1 100); do [ -s "$TMP/tlsport" ] && break; sleep 0.1; done
    if [ -s "$TMP/tlsport" ]; then
        printf 'id,variant,task,files,url\nselfsigned,v,similarity,alpha.tsv,https://127.0.0.1:%s/alpha.tsv\n' \
            "$(cat "$TMP/tlsport")" > "$TMP/tls.csv"
        expect_status "fetch-18 self-signed HTTPS server refused: exit 1" 1 "$VG_BIN" fetch --manifest "$TMP/tls.csv" --data "$DATA" selfsigned
        expect_in "fetch-18 the error is the certificate check" "certificate" "$TMP/err"
        check "fetch-18 nothing installed" test ! -e "$DATA/selfsigned/alpha.tsv"
    else
        skip "the local HTTPS server did not start: $(head -c 200 "$TMP/tls.log")"
    fi
    kill "$TLS_PID" 2>/dev/null
    wait "$TLS_PID" 2>/dev/null
else
    skip "the openssl tool is not installed: the TLS check is not run (scripts/install-deps installs it)"
fi

# fetch-19 (issue 29): the loopback check parses the address: a name that
# merely begins with "127." is anyone's domain, refused before any lookup.
expect_status "fetch-19 http://127.0.0.1.example.invalid refused with --allow-http" 1 \
    "${F[@]}" --allow-http prefixed
expect_in "fetch-19 says why" "loopback host only" "$TMP/err"

# fetch-20: the read check of a staged file keeps to --max-bytes: a
# 1 kB gzip file inflating to 2 MB used to pass the limit there.
expect_status "fetch-20 a staged file inflating past --max-bytes: exit 1" 1 \
    "${F[@]}" --allow-http --max-bytes 100000 bomb
expect_in "fetch-20 names the limit" "holds more than 100000 bytes once decompressed" "$TMP/err"
check "fetch-20 nothing installed" test ! -e "$DATA/bomb"

# fetch-21: a suite's files are installed in one step. The report: fetch
# --force of a split suite failed after one file was replaced (the other's
# place held a folder), leaving a mixed copy and a stale record. Now the
# folder is replaced whole, what else it held is kept, and a failure at
# the last step (test hook) leaves the old copy and record untouched.
expect_status "fetch-21 split suite installed" 0 "${F[@]}" --allow-http split
rm "$DATA/split/q.answers"
mkdir -p "$DATA/split/q.answers" "$DATA/split/mine"
echo keep > "$DATA/split/q.answers/x"
echo "my notes" > "$DATA/split/mine/notes.txt"
echo "stale" > "$DATA/split/q.questions"
expect_status "fetch-21 --force over a folder in a file's place: exit 0" 0 \
    "${F[@]}" --allow-http --force split
check "fetch-21 both files are the new ones" cmp "$DATA/split/q.answers" <(printf 'd\nh\n')
check "fetch-21 questions replaced" cmp "$DATA/split/q.questions" <(printf 'a b c\ne f g\n')
check "fetch-21 the user's own files kept" test "$(cat "$DATA/split/mine/notes.txt")" = "my notes"
check "fetch-21 the record names the installed digests" grep -q "$(sha256sum "$DATA/split/q.answers" | cut -d' ' -f1)" "$DATA/split/vecgauge-fetch.csv"
cp -r "$DATA/split" "$TMP/split-before"
echo "changed by hand" > "$DATA/split/q.questions"
cp "$DATA/split/q.questions" "$TMP/split-before/q.questions"
VECGAUGE_TEST_FAIL_INSTALL=1 expect_status "fetch-21 a failure at the install step: exit 1" 1 \
    "${F[@]}" --allow-http --force split
check "fetch-21 the old copy and its record untouched" diff -r "$TMP/split-before" "$DATA/split"
if [ -z "$(find "$DATA" -maxdepth 1 -name '.fetch-*')" ]; then ok "fetch-21 no staging directory left"; else
    not_ok "fetch-21 staging directories left: $(ls -a "$DATA")"; fi

# fetch-22: --timeout counts the time without data over every address of
# a suite: a server that accepts and never answers, behind three
# addresses, used to cost the timeout three times (9.5 s for --timeout 3).
# A local server started here; the bound is generous (the old behaviour
# took at least 6 s, the new one about 2).
"$PY" - "$TMP/stallport" > "$TMP/stall.log" 2>&1 <<'PYEOF' &
import os, socket, sys, time
s = socket.socket()
s.bind(("127.0.0.1", 0))
s.listen(64)
with open(sys.argv[1] + ".tmp", "w") as f:
    f.write(str(s.getsockname()[1]))
os.rename(sys.argv[1] + ".tmp", sys.argv[1])
held = []
while True:
    c, _ = s.accept()
    held.append(c)      # never answered
PYEOF
STALL_PID=$!
for _ in $(seq 1 100); do [ -s "$TMP/stallport" ] && break; sleep 0.1; done
if [ -s "$TMP/stallport" ]; then
    SU="http://127.0.0.1:$(cat "$TMP/stallport")"
    printf 'id,variant,task,files,url\nstalled,a,similarity,alpha.tsv,%s/a.tsv\nstalled,b,,alpha.tsv,%s/b.tsv\nstalled,c,,alpha.tsv,%s/c.tsv\n' \
        "$SU" "$SU" "$SU" > "$TMP/stall.csv"
    t0=$(date +%s.%N)
    expect_status "fetch-22 a stalled server: exit 1" 1 \
        "$VG_BIN" fetch --manifest "$TMP/stall.csv" --data "$DATA" --allow-http --timeout 2 stalled
    t1=$(date +%s.%N)
    expect_in "fetch-22 says no data came" "no data for 2 s" "$TMP/err"
    if "$PY" -c "import sys; sys.exit(0 if float(sys.argv[2]) - float(sys.argv[1]) < 5.5 else 1)" "$t0" "$t1"; then
        ok "fetch-22 --timeout 2 over three addresses ends within 5.5 s"
    else
        not_ok "fetch-22 took $("$PY" -c "import sys; print(float(sys.argv[2]) - float(sys.argv[1]))" "$t0" "$t1") s"
    fi
else
    skip "the stalled server did not start: $(head -c 200 "$TMP/stall.log")"
fi
kill "$STALL_PID" 2>/dev/null
wait "$STALL_PID" 2>/dev/null

# fetch-17: usage errors.
expect_status "fetch-17 no id: usage error 2" 2 "${F[@]}"
expect_status "fetch-17 unknown id: usage error 2" 2 "${F[@]}" no-such-suite
done_testing
