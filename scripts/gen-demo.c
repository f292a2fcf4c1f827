/* gen-demo.c - generate the demo scenario's data from a fixed seed.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The scenario (invented): Tidewater Provisions, a regional grocery
 * distributor, trained word vectors on its catalogue, recipes and support
 * chats to power product search. It has three candidate vector sets and
 * must pick one to deploy:
 *   tide-full   15 epochs, full vocabulary          (best)
 *   tide-half    8 epochs, full vocabulary          (close to tide-full:
 *                                                    noise-level difference)
 *   tide-quick   1 epoch, pruned vocabulary         (clearly worse, and it
 *                                                    misses some words)
 * plus a training run of six checkpoints (tide-ckpt1 .. tide-ckpt6) that
 * improves steadily until checkpoint 6, where a planted fault (a learning
 * rate spike) makes it regress. Staff rated 240 product pairs (0-10: "how
 * interchangeable are these for a shopper?") and wrote 450 analogy
 * questions in three sections.
 *
 * How the data is made: every vocabulary word has a latent "true" vector
 * (a category centroid plus an individual part; plural and comparative
 * forms add a shared offset; aisle words sit at their category centroid
 * plus an aisle offset). Human ratings are a noisy monotone function of
 * the latent cosine. A candidate vector set is the latent vectors plus
 * Gaussian noise whose size stands for training quality, so less noise
 * means genuinely better vectors. Everything comes from one splitmix64
 * stream per purpose, so the output is identical on every run.
 *
 * Usage: gen-demo OUTDIR
 */
#include <errno.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#define DIMS 64
/* Size of the individual part of a derived form (plural, comparative,
 * aisle word) next to its shared offset: large enough that the offsets
 * answer most analogy questions, but not all (accuracies near 75% for the
 * good candidates, not a ceiling). Only scales draws, so the similarity
 * data does not change with it. */
#define FORM_NOISE 0.9
#define MAX_WORDS 4096
#define N_FILLER 2600

/* ---- deterministic random numbers ---------------------------------- */

typedef struct rng {
    uint64_t s;
} rng;

/* splitmix64 (Steele, Lea and Flood 2014). */
static uint64_t next_u64(rng *r) {
    uint64_t z = (r->s += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

static double uniform(rng *r) { return (double)(next_u64(r) >> 11) * 0x1.0p-53; }

static size_t below(rng *r, size_t n) { return (size_t)(uniform(r) * (double)n); }

/* Standard normal by Box-Muller (one value per call, for simplicity). */
static double normal(rng *r) {
    double u1 = uniform(r), u2 = uniform(r);
    if (u1 < 1e-300) u1 = 1e-300;
    return sqrt(-2.0 * log(u1)) * cos(6.283185307179586 * u2);
}

/* ---- the vocabulary ------------------------------------------------- */

#define N_CAT 10
#define PER_CAT 20

static const char *const categories[N_CAT][PER_CAT] = {
    {"apple", "pear", "plum", "peach", "apricot", "cherry", "grape", "lemon", "lime", "orange",
     "mango", "banana", "melon", "kiwi", "fig", "date", "papaya", "guava", "quince", "nectarine"},
    {"carrot", "onion", "leek", "potato", "turnip", "parsnip", "celery", "cabbage", "lettuce",
     "spinach", "pepper", "tomato", "cucumber", "radish", "beet", "squash", "pumpkin", "zucchini",
     "garlic", "shallot"},
    {"milk", "butter", "cheese", "yogurt", "cream", "cheddar", "brie", "gouda", "ricotta", "kefir",
     "custard", "margarine", "ghee", "mozzarella", "feta", "paneer", "quark", "curd", "buttermilk",
     "camembert"},
    {"bread", "bagel", "muffin", "croissant", "baguette", "roll", "bun", "scone", "brioche", "loaf",
     "pretzel", "doughnut", "biscuit", "cracker", "tortilla", "pita", "waffle", "crumpet",
     "focaccia", "ciabatta"},
    {"beef", "pork", "lamb", "chicken", "turkey", "sausage", "bacon", "ham", "steak", "mince",
     "veal", "duck", "salami", "chorizo", "brisket", "chop", "cutlet", "meatball", "burger", "rib"},
    {"salmon", "tuna", "cod", "haddock", "trout", "shrimp", "prawn", "crab", "lobster", "mussel",
     "oyster", "clam", "squid", "sardine", "anchovy", "mackerel", "halibut", "scallop", "herring",
     "eel"},
    {"coffee", "tea", "juice", "soda", "cola", "lemonade", "water", "cider", "beer", "wine",
     "espresso", "latte", "smoothie", "cocoa", "tonic", "kombucha", "lager", "ale", "stout",
     "sherry"},
    {"rice", "pasta", "flour", "sugar", "salt", "oats", "lentil", "bean", "noodle", "cereal",
     "honey", "jam", "vinegar", "oil", "ketchup", "mustard", "mayonnaise", "syrup", "couscous",
     "quinoa"},
    {"soap", "detergent", "bleach", "sponge", "mop", "broom", "cloth", "brush", "polish", "cleaner",
     "wipe", "scrubber", "bucket", "duster", "towel", "napkin", "glove", "softener", "degreaser",
     "disinfectant"},
    {"pan", "pot", "skillet", "wok", "kettle", "ladle", "spatula", "whisk", "knife", "grater",
     "peeler", "colander", "tray", "tin", "sieve", "tongs", "mixer", "blender", "toaster",
     "grill"}};

/* The aisle each category is shelved in. */
static const char *const aisles[N_CAT] = {"produce", "greengrocer", "dairy", "bakery",
                                          "butcher", "fishmonger", "drinks", "pantry",
                                          "household", "kitchenware"};

/* Categories whose items are countable and get plural forms. */
static const int countable[N_CAT] = {1, 1, 0, 1, 0, 0, 0, 0, 1, 1};

#define N_ADJ 20
static const char *const adjectives[N_ADJ][2] = {
    {"fresh", "fresher"}, {"ripe", "riper"},   {"sweet", "sweeter"}, {"sour", "sourer"},
    {"cheap", "cheaper"}, {"crisp", "crisper"}, {"soft", "softer"},  {"hard", "harder"},
    {"thick", "thicker"}, {"thin", "thinner"}, {"mild", "milder"},   {"rich", "richer"},
    {"light", "lighter"}, {"dark", "darker"},  {"lean", "leaner"},   {"moist", "moister"},
    {"spicy", "spicier"}, {"salty", "saltier"}, {"juicy", "juicier"}, {"fine", "finer"}};

typedef struct word {
    char text[32];
    double latent[DIMS];
    double freq;      /* sort key for the file order (lower: earlier) */
    int item;         /* 1 for a singular catalogue item */
    int cat;          /* category, or -1 */
} word;

static word words[MAX_WORDS];
static size_t n_words;

static void plural_of(const char *s, char *out, size_t size) {
    size_t n = strlen(s);
    if (n > 1 && s[n - 1] == 'y' && !strchr("aeiou", s[n - 2]))
        snprintf(out, size, "%.*sies", (int)(n - 1), s);
    else if ((n > 1 && (strcmp(s + n - 2, "sh") == 0 || strcmp(s + n - 2, "ch") == 0)) ||
             s[n - 1] == 's' || s[n - 1] == 'x' || s[n - 1] == 'o')
        snprintf(out, size, "%ses", s);
    else if (n > 2 && strcmp(s + n - 2, "fe") == 0)
        snprintf(out, size, "%.*sves", (int)(n - 2), s);
    else
        snprintf(out, size, "%ss", s);
}

static size_t find_word(const char *s) {
    for (size_t i = 0; i < n_words; i++)
        if (strcmp(words[i].text, s) == 0) return i;
    fprintf(stderr, "gen-demo: internal error: no word %s\n", s);
    exit(1);
}

static word *add_word(const char *s) {
    if (n_words >= MAX_WORDS) {
        fprintf(stderr, "gen-demo: internal error: too many words\n");
        exit(1);
    }
    word *w = &words[n_words++];
    memset(w, 0, sizeof *w);
    snprintf(w->text, sizeof w->text, "%s", s);
    w->cat = -1;
    return w;
}

static void random_vec(rng *r, double *v, double scale) {
    for (int j = 0; j < DIMS; j++) v[j] = scale * normal(r) / sqrt((double)DIMS);
}

static double cosine(const double *a, const double *b) {
    double d = 0, na = 0, nb = 0;
    for (int j = 0; j < DIMS; j++) {
        d += a[j] * b[j];
        na += a[j] * a[j];
        nb += b[j] * b[j];
    }
    return d / sqrt(na * nb);
}

/* Pseudo-words for the long tail of the vocabulary (product codes,
 * brand-like strings): syllables picked by the stream. */
static void pseudo_word(rng *r, char *out, size_t size) {
    static const char *const syl[] = {"ka", "lo", "mi", "ren", "tu", "vas", "bri", "do",
                                      "fen", "gal", "hu", "jo", "pel", "qui", "sor", "tam",
                                      "ul", "ve", "wix", "yor", "zen", "ar", "bel", "cor"};
    size_t nsyl = sizeof syl / sizeof syl[0];
    int k = 2 + (int)below(r, 3);
    out[0] = '\0';
    for (int i = 0; i < k; i++) strncat(out, syl[below(r, nsyl)], size - strlen(out) - 1);
}

static void build_vocabulary(void) {
    rng r = {20261202u};
    double centroid[N_CAT][DIMS], plural_off[DIMS], comp_off[DIMS], aisle_off[DIMS],
        adj_centroid[DIMS];
    for (int k = 0; k < N_CAT; k++) random_vec(&r, centroid[k], 1.0);
    random_vec(&r, plural_off, 0.9);
    random_vec(&r, comp_off, 0.9);
    random_vec(&r, aisle_off, 1.0);
    random_vec(&r, adj_centroid, 1.0);

    for (int k = 0; k < N_CAT; k++) {
        for (int i = 0; i < PER_CAT; i++) {
            word *w = add_word(categories[k][i]);
            double u[DIMS];
            random_vec(&r, u, 0.75);
            for (int j = 0; j < DIMS; j++) w->latent[j] = centroid[k][j] + u[j];
            w->item = 1;
            w->cat = k;
            /* Common items come first in a frequency-ordered file. */
            w->freq = (double)i * 40 + uniform(&r) * 400;
        }
    }
    for (int k = 0; k < N_CAT; k++) {
        if (!countable[k]) continue;
        for (int i = 0; i < PER_CAT; i++) {
            char pl[48];
            plural_of(categories[k][i], pl, sizeof pl);
            const word *base = &words[find_word(categories[k][i])];
            double base_latent[DIMS];
            memcpy(base_latent, base->latent, sizeof base_latent);
            double base_freq = base->freq;
            word *w = add_word(pl);
            double e[DIMS];
            random_vec(&r, e, FORM_NOISE);
            for (int j = 0; j < DIMS; j++) w->latent[j] = base_latent[j] + plural_off[j] + e[j];
            w->cat = k;
            w->freq = base_freq + 200 + uniform(&r) * 600;
        }
    }
    for (int k = 0; k < N_CAT; k++) {
        word *w = add_word(aisles[k]);
        double e[DIMS];
        random_vec(&r, e, FORM_NOISE);
        for (int j = 0; j < DIMS; j++) w->latent[j] = centroid[k][j] + aisle_off[j] + e[j];
        w->cat = k;
        w->freq = uniform(&r) * 300;
    }
    for (int a = 0; a < N_ADJ; a++) {
        word *w = add_word(adjectives[a][0]);
        double u[DIMS];
        random_vec(&r, u, 0.8);
        for (int j = 0; j < DIMS; j++) w->latent[j] = adj_centroid[j] + u[j];
        w->freq = uniform(&r) * 500;
        double base_latent[DIMS];
        memcpy(base_latent, w->latent, sizeof base_latent);
        word *c = add_word(adjectives[a][1]);
        double e[DIMS];
        random_vec(&r, e, FORM_NOISE);
        for (int j = 0; j < DIMS; j++) c->latent[j] = base_latent[j] + comp_off[j] + e[j];
        c->freq = 400 + uniform(&r) * 900;
    }
    for (int f = 0; f < N_FILLER; f++) {
        char s[32];
        do {
            pseudo_word(&r, s, sizeof s);
        } while (strlen(s) < 4);
        /* Skip collisions with words already present. */
        int dup = 0;
        for (size_t i = 0; i < n_words && !dup; i++) dup = strcmp(words[i].text, s) == 0;
        if (dup) continue;
        word *w = add_word(s);
        random_vec(&r, w->latent, 1.0);
        int k = (int)below(&r, N_CAT);
        for (int j = 0; j < DIMS; j++) w->latent[j] += 0.4 * centroid[k][j];
        w->freq = 300 + uniform(&r) * 6000;
    }
}

/* ---- the suites ----------------------------------------------------- */

static int mkdir_p(const char *dir) {
    if (mkdir(dir, 0777) != 0 && errno != EEXIST) {
        fprintf(stderr, "gen-demo: cannot create %s: %s\n", dir, strerror(errno));
        return -1;
    }
    return 0;
}

static FILE *open_out(const char *dir, const char *name) {
    char path[4096];
    snprintf(path, sizeof path, "%s/%s", dir, name);
    FILE *fp = fopen(path, "w");
    if (!fp) {
        fprintf(stderr, "gen-demo: cannot write %s: %s\n", path, strerror(errno));
        exit(1);
    }
    return fp;
}

static int close_out(FILE *fp) {
    if (ferror(fp) | fclose(fp)) {
        fprintf(stderr, "gen-demo: write failed\n");
        return -1;
    }
    return 0;
}

#define N_PAIRS 240

static int write_pairs(const char *dir) {
    rng r = {7001u};
    FILE *fp = open_out(dir, "tidewater-pairs.tsv");
    fprintf(fp, "# Tidewater Provisions staff ratings (invented demo data).\n");
    fprintf(fp, "# 0 = not interchangeable at all, 10 = a shopper would happily swap them.\n");
    fprintf(fp, "word1\tword2\trating\n");
    size_t done = 0;
    static unsigned char used[N_CAT * PER_CAT][N_CAT * PER_CAT];
    while (done < N_PAIRS) {
        /* Half the pairs within a category, half across. */
        int k1 = (int)below(&r, N_CAT);
        int k2 = done % 2 ? k1 : (int)below(&r, N_CAT);
        int i1 = (int)below(&r, PER_CAT), i2 = (int)below(&r, PER_CAT);
        int a = k1 * PER_CAT + i1, b = k2 * PER_CAT + i2;
        if (a == b || used[a][b] || used[b][a]) continue;
        used[a][b] = 1;
        const word *w1 = &words[find_word(categories[k1][i1])];
        const word *w2 = &words[find_word(categories[k2][i2])];
        double c = cosine(w1->latent, w2->latent);
        double rating = 10.0 * pow(0.5 + 0.5 * c, 1.5) + 0.7 * normal(&r);
        if (rating < 0) rating = 0;
        if (rating > 10) rating = 10;
        fprintf(fp, "%s\t%s\t%.1f\n", w1->text, w2->text, rating);
        done++;
    }
    return close_out(fp);
}

static int write_analogies(const char *dir) {
    rng r = {7002u};
    FILE *fp = open_out(dir, "tidewater-analogies.txt");
    fprintf(fp, ": plural\n");
    for (int q = 0; q < 150;) {
        int k1, k2;
        do k1 = (int)below(&r, N_CAT);
        while (!countable[k1]);
        do k2 = (int)below(&r, N_CAT);
        while (!countable[k2]);
        int i1 = (int)below(&r, PER_CAT), i2 = (int)below(&r, PER_CAT);
        if (k1 == k2 && i1 == i2) continue;
        char p1[48], p2[48];
        plural_of(categories[k1][i1], p1, sizeof p1);
        plural_of(categories[k2][i2], p2, sizeof p2);
        fprintf(fp, "%s %s %s %s\n", categories[k1][i1], p1, categories[k2][i2], p2);
        q++;
    }
    fprintf(fp, ": comparative\n");
    for (int q = 0; q < 150;) {
        int a = (int)below(&r, N_ADJ), b = (int)below(&r, N_ADJ);
        if (a == b) continue;
        fprintf(fp, "%s %s %s %s\n", adjectives[a][0], adjectives[a][1], adjectives[b][0],
                adjectives[b][1]);
        q++;
    }
    fprintf(fp, ": aisle\n");
    for (int q = 0; q < 150;) {
        int k1 = (int)below(&r, N_CAT), k2 = (int)below(&r, N_CAT);
        if (k1 == k2) continue;
        int i1 = (int)below(&r, PER_CAT), i2 = (int)below(&r, PER_CAT);
        fprintf(fp, "%s %s %s %s\n", categories[k1][i1], aisles[k1], categories[k2][i2],
                aisles[k2]);
        q++;
    }
    return close_out(fp);
}

/* ---- the vector sets ------------------------------------------------ */

typedef struct candidate {
    const char *file;
    double noise;       /* standard deviation relative to a unit latent */
    double drop;        /* fraction of catalogue words missing from the vocabulary */
    uint64_t seed;
} candidate;

static int cmp_freq(const void *a, const void *b) {
    double x = words[*(const size_t *)a].freq, y = words[*(const size_t *)b].freq;
    return (x > y) - (x < y);
}

static int write_vectors(const char *dir, const candidate *c) {
    rng r = {c->seed};
    size_t order[MAX_WORDS];
    for (size_t i = 0; i < n_words; i++) order[i] = i;
    qsort(order, n_words, sizeof order[0], cmp_freq);
    unsigned char keep[MAX_WORDS];
    size_t rows = 0;
    for (size_t i = 0; i < n_words; i++) {
        /* A pruned vocabulary loses rarer catalogue words and forms. */
        keep[i] = !(words[i].cat >= 0 && words[i].freq > 500 && uniform(&r) < c->drop);
        rows += keep[i];
    }
    /* A random rotation-free "training" basis: the noise alone decides
     * quality; a rotation would not change any cosine. */
    FILE *fp = open_out(dir, c->file);
    fprintf(fp, "%zu %d\n", rows, DIMS);
    for (size_t o = 0; o < n_words; o++) {
        size_t i = order[o];
        if (!keep[i]) continue;
        fputs(words[i].text, fp);
        for (int j = 0; j < DIMS; j++) {
            double x = words[i].latent[j] + c->noise * normal(&r) / sqrt((double)DIMS);
            fprintf(fp, " %.5f", x);
        }
        fputc('\n', fp);
    }
    return close_out(fp);
}

int main(int argc, char **argv) {
    if (argc != 2) {
        fprintf(stderr, "usage: gen-demo OUTDIR\n");
        return 2;
    }
    const char *dir = argv[1];
    if (mkdir_p(dir) != 0) return 1;
    build_vocabulary();
    static const candidate sets[] = {
        {"tide-full.txt", 0.45, 0.0, 101},  {"tide-half.txt", 0.48, 0.0, 102},
        {"tide-quick.txt", 1.10, 0.25, 103}, {"tide-ckpt1.txt", 1.70, 0.0, 201},
        {"tide-ckpt2.txt", 1.10, 0.0, 202}, {"tide-ckpt3.txt", 0.80, 0.0, 203},
        {"tide-ckpt4.txt", 0.60, 0.0, 204}, {"tide-ckpt5.txt", 0.50, 0.0, 205},
        {"tide-ckpt6.txt", 1.25, 0.0, 206}};
    if (write_pairs(dir) != 0 || write_analogies(dir) != 0) return 1;
    for (size_t i = 0; i < sizeof sets / sizeof sets[0]; i++)
        if (write_vectors(dir, &sets[i]) != 0) return 1;
    return 0;
}
