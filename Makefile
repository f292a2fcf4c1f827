# Makefile - build, test, demo, benchmark and install vecgauge.
# Part of vecgauge; MIT licence, see LICENSE.
#
#   make               library, tool and test programs (build/)
#   make check         the whole test suite, then again under ASan+UBSan
#   make demo          generate the demo data and score it (results/)
#   make bench         the benchmark script (scripts/bench)
#   make install       PREFIX=/usr/local DESTDIR=
#   make SANITIZE=1    build with AddressSanitizer and UBSan (build/san/)
#   make WERROR=1      warnings are errors (CI)

PREFIX  ?= /usr/local
DESTDIR ?=
CC      ?= cc
PKG_CONFIG ?= pkg-config

ifeq ($(SANITIZE),1)
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
PKGS      = openblas zlib libcrypto jansson libcurl libarchive cairo
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
$(shell mkdir -p $(BUILD)/gen; \
  printf '#define VG_GIT_DESCRIBE "%s"\n' '$(GIT_DESCRIBE)' > $(GITDESC_H).new; \
  cmp -s $(GITDESC_H).new $(GITDESC_H) || mv $(GITDESC_H).new $(GITDESC_H); rm -f $(GITDESC_H).new)

# ---- the library, by the stage the data flows through --------------------
COMMON_O  = common/error.o common/alloc.o common/arena.o common/strmap.o \
            common/text.o common/lines.o common/sha256.o common/threads.o \
            common/numfmt.o common/version.o common/bigbuf.o
VECTORS_O = vectors/vectors.o vectors/load.o vectors/detect.o vectors/source.o \
            vectors/gzip.o vectors/fastfloat.o vectors/text.o vectors/binary.o \
            vectors/npy.o vectors/vocab.o vectors/batch.o
SUITES_O  = suites/suite.o suites/fields.o suites/pairs.o suites/analogies.o
SCORE_O   = score/similarity.o score/analogy.o
STATS_O   = stats/rank.o stats/correlation.o stats/resample.o
EVAL_O    = eval/results.o eval/evaluate.o eval/similarity_rows.o
REPORT_O  = report/csvout.o report/summary_md.o report/rundir.o
CLI_O     = cli/main.o cli/util.o cli/cmd_score.o cli/cmd_inspect.o cli/loadopts.o \
            cli/progress.o

LIB_O = $(addprefix $(BUILD)/obj/,$(COMMON_O) $(VECTORS_O) $(SUITES_O) \
          $(SCORE_O) $(STATS_O) $(EVAL_O) $(REPORT_O))
BIN_O = $(addprefix $(BUILD)/obj/,$(CLI_O))

LIB   = $(BUILD)/libvecgauge.a
BIN   = $(BUILD)/vecgauge

# ---- tests --------------------------------------------------------------
UNIT_TESTS = $(patsubst tests/unit/%.c,$(BUILD)/tests/%,$(wildcard tests/unit/test_*.c))
TEST_HELPERS = $(BUILD)/tests/inprocess_example $(BUILD)/tests/vgstat
TEST_CFLAGS := $(shell $(PKG_CONFIG) --cflags cmocka 2>/dev/null)
TEST_LIBS   := $(shell $(PKG_CONFIG) --libs cmocka 2>/dev/null)

# ---- demo ---------------------------------------------------------------
GEN_DEMO = $(BUILD)/gen-demo
DEMO_DIR = $(BUILD)/demo

.PHONY: all check check-fast demo bench install uninstall clean deps tests

all: deps $(LIB) $(BIN) tests

tests: $(UNIT_TESTS) $(TEST_HELPERS) $(GEN_DEMO)

deps: $(BUILD)/.deps-ok
$(BUILD)/.deps-ok: scripts/deps.list scripts/check-deps
	@CC=$(CC) scripts/check-deps build
	@mkdir -p $(@D) && touch $@

$(BUILD)/obj/%.o: src/%.c | deps
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -MMD -MP -c $< -o $@

$(LIB): $(LIB_O)
	@rm -f $@
	ar rcs $@ $^

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

$(BUILD)/tests/vgstat: tests/tools/vgstat.c $(LIB)
	@mkdir -p $(@D)
	$(CC) $(CPPFLAGS) $(CFLAGS) -o $@ $< $(LIB) $(LDFLAGS) $(LDLIBS)

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

install: all
	install -d $(DESTDIR)$(PREFIX)/bin $(DESTDIR)$(PREFIX)/lib $(DESTDIR)$(PREFIX)/include/vecgauge
	install -m 755 $(BIN) $(DESTDIR)$(PREFIX)/bin/vecgauge
	install -m 644 $(LIB) $(DESTDIR)$(PREFIX)/lib/libvecgauge.a
	install -m 644 include/vecgauge/*.h $(DESTDIR)$(PREFIX)/include/vecgauge/

uninstall:
	rm -f $(DESTDIR)$(PREFIX)/bin/vecgauge $(DESTDIR)$(PREFIX)/lib/libvecgauge.a
	rm -f $(addprefix $(DESTDIR)$(PREFIX)/include/vecgauge/,$(notdir $(wildcard include/vecgauge/*.h)))
	-rmdir $(DESTDIR)$(PREFIX)/include/vecgauge

clean:
	rm -rf build

-include $(LIB_O:.o=.d) $(BIN_O:.o=.d)
