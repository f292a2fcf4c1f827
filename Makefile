# Makefile - build, test, demo, benchmark and install vecgauge.
# Part of vecgauge; MIT licence, see LICENSE.
#
#   make               library, tool and test programs (build/)
#   make check         the whole test suite, then again under ASan+UBSan
#   make demo          generate the demo data and score it (results/)
#   make bench         the benchmark script (scripts/bench)
#   make install       PREFIX=/usr/local DESTDIR=
#   make SANITIZE=1    build with AddressSanitizer and UBSan (build/san/)
#   make fuzz          libFuzzer targets with clang (build/fuzz/); run: scripts/fuzz
#   make WERROR=1      warnings are errors (CI)

PREFIX  ?= /usr/local
DESTDIR ?=
CC      ?= cc
PKG_CONFIG ?= pkg-config

ifeq ($(FUZZ),1)
# libFuzzer build (clang): the library instrumented for coverage, targets
# linked with -fsanitize=fuzzer by `make fuzz`.
BUILD   ?= build/fuzz
CC       = clang
SANFLAGS = -fsanitize=fuzzer-no-link,address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer
OPT     ?= -O1 -g
else ifeq ($(SANITIZE),1)
BUILD   ?= build/san
SANFLAGS = -fsanitize=address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer
OPT     ?= -O1 -g
else
BUILD   ?= build
SANFLAGS =
OPT     ?= -O2 -g
endif

WARN = -Wall -Wextra -Wpedantic -Wshadow -Wstrict-prototypes -Wmissing-prototypes \
       -Wformat=2 -Wpointer-arith -Wundef -Wvla -Wcast-qual -Wwrite-strings \
       -Wno-format-nonliteral $(if $(filter 1,$(WERROR)),-Werror)

# Every library but GSL comes through pkg-config. GSL's .pc file adds its
# reference CBLAS (-lgslcblas), which would shadow OpenBLAS's optimised
# cblas_* symbols; link -lgsl alone and let OpenBLAS provide CBLAS.
PKGS      = openblas zlib libcrypto jansson libcurl libarchive cairo fontconfig
PKG_CFLAGS := $(shell $(PKG_CONFIG) --cflags $(PKGS) 2>/dev/null)
PKG_LIBS   := $(shell $(PKG_CONFIG) --libs $(PKGS) 2>/dev/null)

CPPFLAGS += -Iinclude -I$(BUILD)/gen -D_GNU_SOURCE -DVG_DEBUG $(PKG_CFLAGS)
CFLAGS   += -std=c11 $(OPT) $(WARN) $(SANFLAGS) -fPIC -fvisibility=hidden -pthread
LDFLAGS  += $(SANFLAGS) -pthread
LDLIBS    = -lgsl $(PKG_LIBS) -lcsv -lunistring -lm

# `git describe` of the checkout, for provenance; rewritten only when it
# changes so that an unchanged tree does not rebuild.
GIT_DESCRIBE := $(shell git describe --always --dirty --tags 2>/dev/null)
GITDESC_H = $(BUILD)/gen/vg_gitdesc.h
# (A temporary name per make process: two makes may run at once.)
$(shell mkdir -p $(BUILD)/gen; t=$(GITDESC_H).new.$$$$; \
  printf '#define VG_GIT_DESCRIBE "%s"\n' '$(GIT_DESCRIBE)' > $$t; \
  cmp -s $$t $(GITDESC_H) || mv $$t $(GITDESC_H); rm -f $$t)

# ---- the library, by the stage the data flows through --------------------
COMMON_O  = common/error.o common/alloc.o common/arena.o common/strmap.o \
            common/text.o common/lines.o common/sha256.o common/threads.o \
            common/numfmt.o common/version.o common/csvread.o common/bigbuf.o \
            common/filemap.o common/blas_pool.o common/infile.o
VECTORS_O = vectors/vectors.o vectors/load.o vectors/detect.o vectors/source.o \
            vectors/gzip.o vectors/fastfloat.o vectors/text.o vectors/binary.o \
            vectors/npy.o vectors/vocab.o vectors/batch.o vectors/digest_cache.o
SUITES_O  = suites/suite.o suites/fields.o suites/pairs.o suites/analogies.o \
            suites/relation.o suites/split.o suites/groups.o suites/manifest.o \
            suites/datadir.o suites/pairids.o gen/manifest_csv.o
FETCH_O   = fetch/download.o fetch/extract.o fetch/fetch.o
SCORE_O   = score/similarity.o score/analogy.o score/analogy_kernel.o score/missing.o
STATS_O   = stats/rank.o stats/correlation.o stats/kendall.o stats/interval.o \
            stats/resample.o stats/corrboot.o stats/agreement.o \
            stats/paired_correlation.o stats/paired_counts.o stats/wilson.o \
            stats/pairboot.o stats/quantile.o
EVAL_O    = eval/results.o eval/evaluate.o eval/similarity_rows.o eval/agreement.o \
            eval/analogy_rows.o
COMPARE_O = compare/compare.o compare/compare_similarity.o compare/compare_analogy.o \
            compare/paired_items.o
REPORT_O  = report/csvout.o report/summary_md.o report/summary_similarity.o \
            report/summary_analogy.o report/text_table.o report/intervals.o \
            report/items_csv.o report/latex.o
REPORT_O += report/comparison_csv.o report/comparison_md.o report/plot.o \
            report/plot_compare.o
RUNDIR_O  = rundir/rundir.o rundir/outdir.o rundir/cleanup.o rundir/plots.o rundir/provenance.o \
            rundir/json_text.o rundir/run_json.o rundir/run_record.o rundir/saved_run.o \
            rundir/saved_pair.o rundir/saved_results.o rundir/merge.o rundir/comparison_json.o \
            rundir/compare_summary.o
TRACK_O   = track/history.o track/select.o track/paths.o track/track.o track/track_report.o \
            track/plot_track.o
CLI_O     = cli/main.o cli/util.o cli/run_output.o cli/cmd_score.o \
            cli/cmd_rerun.o cli/cmd_suites.o cli/cmd_fetch.o cli/cmd_inspect.o \
            cli/loadopts.o cli/statopts.o cli/progress.o
CLI_O    += cli/cmd_compare.o cli/cmd_track.o cli/cmd_merge.o

LIB_O = $(addprefix $(BUILD)/obj/,$(COMMON_O) $(VECTORS_O) $(SUITES_O) $(FETCH_O) \
          $(SCORE_O) $(STATS_O) $(EVAL_O) $(COMPARE_O) $(REPORT_O) $(RUNDIR_O) $(TRACK_O))
BIN_O = $(addprefix $(BUILD)/obj/,$(CLI_O))

LIB   = $(BUILD)/libvecgauge.a
BIN   = $(BUILD)/vecgauge
# The shared library: versioned file name, soname on the major version.
SONAME = libvecgauge.so.$(VERSION_MAJOR)
SOLIB  = $(BUILD)/libvecgauge.so.$(VERSION)
VERSION       := $(shell sed -n 's/^\#define VG_VERSION_STRING "\(.*\)"/\1/p' include/vecgauge/vg_config.h)
VERSION_MAJOR := $(firstword $(subst ., ,$(VERSION)))
PC    = $(BUILD)/vecgauge.pc

# ---- tests --------------------------------------------------------------
UNIT_TESTS = $(patsubst tests/unit/%.c,$(BUILD)/tests/%,$(wildcard tests/unit/test_*.c))
TEST_HELPERS = $(BUILD)/tests/inprocess_example $(BUILD)/tests/vgstat $(BUILD)/tests/vgpaired \
               $(BUILD)/tests/vgbench \
               $(BUILD)/tests/vganalogy
TEST_CFLAGS := $(shell $(PKG_CONFIG) --cflags cmocka 2>/dev/null)
TEST_LIBS   := $(shell $(PKG_CONFIG) --libs cmocka 2>/dev/null)

# ---- fuzzing ------------------------------------------------------------
# Every fuzz/fuzz_NAME.c is a libFuzzer target; each is also linked with
# fuzz/replay.c into a plain program that the test suite runs over the
# saved corpus and regression inputs (tests/e2e/fuzz_replay.sh).
FUZZ_TARGETS = $(patsubst fuzz/fuzz_%.c,%,$(wildcard fuzz/fuzz_*.c))
FUZZ_REPLAY  = $(addprefix $(BUILD)/tests/fuzz_replay_,$(FUZZ_TARGETS))
FUZZ_BINS    = $(addprefix build/fuzz/fuzz_,$(FUZZ_TARGETS))

# ---- demo ---------------------------------------------------------------
GEN_DEMO = $(BUILD)/gen-demo
DEMO_DIR = $(BUILD)/demo

.PHONY: all check check-fast demo bench install uninstall clean deps tests fuzz fuzz-bins

all: deps $(LIB) $(SOLIB) $(PC) $(BIN) tests

tests: $(UNIT_TESTS) $(TEST_HELPERS) $(GEN_DEMO) $(FUZZ_REPLAY)

deps: $(BUILD)/.deps-ok
$(BUILD)/.deps-ok: scripts/deps.list scripts/check-deps
	@CC=$(CC) scripts/check-deps build
	@mkdir -p $(@D) && touch $@

$(BUILD)/obj/%.o: src/%.c | deps
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -MMD -MP -c $< -o $@

# The manifest of known suites, compiled into the library as a byte array
# (od is in coreutils, so no extra tool is needed).
MANIFEST_CSV = benchmarks-manifest/suites.csv
$(BUILD)/gen/manifest_csv.c: $(MANIFEST_CSV)
	@mkdir -p $(@D)
	@{ printf '/* Generated from %s by the Makefile; do not edit. */\n#include <stddef.h>\n' '$<'; \
	  printf '__attribute__((visibility("hidden"))) extern const char vg_manifest_builtin[];\n'; \
	  printf '__attribute__((visibility("hidden"))) extern const size_t vg_manifest_builtin_len;\n'; \
	  printf 'const char vg_manifest_builtin[] = {\n'; \
	  od -An -v -tx1 $< | sed 's/ \([0-9a-f][0-9a-f]\)/0x\1,/g'; \
	  printf '0};\nconst size_t vg_manifest_builtin_len = sizeof vg_manifest_builtin - 1;\n'; } > $@.tmp
	@mv $@.tmp $@
$(BUILD)/obj/gen/manifest_csv.o: $(BUILD)/gen/manifest_csv.c
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -c $< -o $@

$(LIB): $(LIB_O)
	@rm -f $@
	ar rcs $@ $^

$(SOLIB): $(LIB_O)
	$(CC) $(LDFLAGS) -shared -Wl,-soname,$(SONAME) -o $@ $(LIB_O) $(LDLIBS)
	ln -sf $(notdir $@) $(BUILD)/$(SONAME)
	ln -sf $(SONAME) $(BUILD)/libvecgauge.so

$(PC): scripts/vecgauge.pc.in include/vecgauge/vg_config.h Makefile
	sed -e 's|@PREFIX@|$(PREFIX)|' -e 's|@VERSION@|$(VERSION)|' \
	    -e 's|@REQUIRES@|$(PKGS)|' -e 's|@LIBS_PRIVATE@|-lgsl -lcsv -lunistring -lm -pthread|' \
	    scripts/vecgauge.pc.in > $@

$(BIN): $(BIN_O) $(LIB)
	$(CC) $(LDFLAGS) -o $@ $(BIN_O) $(LIB) $(LDLIBS)

$(BUILD)/.testdeps-ok: scripts/deps.list scripts/check-deps
	@CC=$(CC) scripts/check-deps test
	@mkdir -p $(@D) && touch $@

$(BUILD)/tests/%: tests/unit/%.c tests/unit/vgtest.h $(LIB) | $(BUILD)/.testdeps-ok
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) -Isrc $(TEST_CFLAGS) $(CFLAGS) -Wno-missing-prototypes -o $@ $< $(LIB) \
	    $(LDFLAGS) $(TEST_LIBS) $(LDLIBS)

$(BUILD)/tests/inprocess_example: scripts/inprocess_example.c $(LIB)
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -o $@ $< $(LIB) $(LDFLAGS) $(LDLIBS)

$(BUILD)/tests/vg%: tests/tools/vg%.c $(LIB)
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -o $@ $< $(LIB) $(LDFLAGS) $(LDLIBS)

$(BUILD)/tests/fuzz_replay_%: fuzz/fuzz_%.c fuzz/replay.c fuzz/fuzz_input.h $(LIB)
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -Wno-missing-prototypes -o $@ fuzz/fuzz_$*.c fuzz/replay.c $(LIB) \
	    $(LDFLAGS) $(LDLIBS)

# `make fuzz` builds the libFuzzer binaries; scripts/fuzz runs them.
fuzz:
	@$(MAKE) --no-print-directory FUZZ=1 fuzz-bins

fuzz-bins: $(FUZZ_BINS)

build/fuzz/fuzz_%: fuzz/fuzz_%.c fuzz/fuzz_input.h $(LIB)
	$(CC) $(CPPFLAGS) $(CFLAGS) -Wno-missing-prototypes -fsanitize=fuzzer -o $@ $< $(LIB) \
	    $(LDFLAGS) $(LDLIBS)

$(BUILD)/tests/vganalogy: tests/tools/vganalogy.c src/score/analogy_impl.h $(LIB)
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) -Isrc $(CFLAGS) -o $@ $< $(LIB) $(LDFLAGS) $(LDLIBS)

$(GEN_DEMO): scripts/gen-demo.c
	@mkdir -p $(@D)
	$(CC) -std=c11 -O2 $(WARN) $(SANFLAGS) -o $@ $< $(LDFLAGS) -lm

# The whole suite, plain build first, then under ASan+UBSan, warnings as
# errors. The runner prints one line "N passed, N failed" for everything.
check: WERROR = 1
check: all
	@$(MAKE) --no-print-directory SANITIZE=1 WERROR=1 all
	@tests/run --build build --build build/san

# One build only (faster while developing).
check-fast: all
	@tests/run --build $(BUILD)

demo: all
	@scripts/demo $(BUILD)

bench: all
	@scripts/bench $(BUILD)

# What `make install` puts where; `make uninstall` removes exactly these.
HEADERS = $(wildcard include/vecgauge/*.h)
INST_BIN = $(DESTDIR)$(PREFIX)/bin
INST_LIB = $(DESTDIR)$(PREFIX)/lib
INST_INC = $(DESTDIR)$(PREFIX)/include/vecgauge
INST_PC  = $(DESTDIR)$(PREFIX)/lib/pkgconfig
INST_MAN = $(DESTDIR)$(PREFIX)/share/man/man1
INST_SHARE = $(DESTDIR)$(PREFIX)/share/vecgauge
INST_BASHCOMP = $(DESTDIR)$(PREFIX)/share/bash-completion/completions
INSTALLED = $(INST_BIN)/vecgauge $(INST_LIB)/libvecgauge.a $(INST_LIB)/libvecgauge.so.$(VERSION) \
            $(INST_LIB)/$(SONAME) $(INST_LIB)/libvecgauge.so $(INST_PC)/vecgauge.pc \
            $(addprefix $(INST_INC)/,$(notdir $(HEADERS))) \
            $(INST_MAN)/vecgauge.1 $(INST_SHARE)/suites.csv $(INST_BASHCOMP)/vecgauge

install: all
	install -d $(INST_BIN) $(INST_LIB) $(INST_INC) $(INST_PC)
	install -m 755 $(BIN) $(INST_BIN)/vecgauge
	install -m 644 $(LIB) $(INST_LIB)/libvecgauge.a
	install -m 755 $(SOLIB) $(INST_LIB)/libvecgauge.so.$(VERSION)
	ln -sf libvecgauge.so.$(VERSION) $(INST_LIB)/$(SONAME)
	ln -sf $(SONAME) $(INST_LIB)/libvecgauge.so
	install -m 644 $(HEADERS) $(INST_INC)/
	install -m 644 $(PC) $(INST_PC)/vecgauge.pc
	install -d $(INST_MAN) $(INST_SHARE) $(INST_BASHCOMP)
	install -m 644 man/vecgauge.1 $(INST_MAN)/vecgauge.1
	install -m 644 $(MANIFEST_CSV) $(INST_SHARE)/suites.csv
	install -m 644 completion/vecgauge.bash $(INST_BASHCOMP)/vecgauge

uninstall:
	rm -f $(INSTALLED)
	-rmdir $(INST_INC) $(INST_SHARE) 2>/dev/null

clean:
	rm -rf build

-include $(LIB_O:.o=.d) $(BIN_O:.o=.d)
