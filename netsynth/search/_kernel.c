/*
 * The exact search's inner recursion, compiled (netsynth.search.kernel wraps it).
 *
 * It computes, one query row at a time, what ExactSearch's numpy engine computes for many
 * rows at once (netsynth/search/exact.py, "Method" and "Pruning"): the floor and ceil of the
 * values of a family of series/parallel networks of n parts at a target t, within a window
 * [L, U] outside which no value matters. The canonical splits, the target-window cut and the
 * boundary entries are the same, step for step, with the same floating-point expressions (the
 * build turns off contraction into fused multiply-adds), so both give the same answers.
 *
 * Two things only a row-at-a-time loop can do, both exact:
 *   - the window narrows as the row's floor and ceil improve: a value at or below the floor
 *     found so far, or at or above the ceil, can change neither, so [L, U] becomes
 *     [max(L, floor), min(U, ceil)] for the branches that follow;
 *   - a split stops at the first child a whose least join, a + (least x) or a ∥ (least x),
 *     lies above the window: the children come in ascending order and both joins grow with a.
 *
 * Tables are the sorted value arrays of each level (1..h parts): the networks whose top is a
 * series node, a parallel node, or either. On a limited bin (exact.py "Stock limits") each table
 * entry also lists its parts, each row the parts its ancestors took, and no entry is taken that
 * would use more of a value than the bin holds.
 */
#define PY_SSIZE_T_CLEAN
#include <Python.h>
#include <math.h>
#include <stdint.h>
#include <string.h>

#define OP_SERIES 1
#define OP_PARALLEL 2
#define MAX_LEVEL 24   /* tables of up to this many parts */
#define MAX_PARTS 64   /* recursion depth: part counts up to this */

typedef struct {
    const double *v;
    Py_ssize_t n;
    /* an index by the value's leading bits (see tab_lower), or NULL: idx[k] is the first entry whose
     * key (bits >> shift) is at least kmin + k */
    const int32_t *idx;
    long long kmin;
    int shift;
    /* limited bins: the bin-value indices of each entry's parts, `width` per entry (else NULL) */
    const int16_t *parts;
    int width;
} Tab;

typedef struct {
    Tab ser[MAX_LEVEL + 1], par[MAX_LEVEL + 1], any[MAX_LEVEL + 1];
    int h;
    double vmin, vmax;
    long long looked;
    volatile const int32_t *stop; /* set by the caller to end the call early (Ctrl-C) */
    const int64_t *limits;        /* limited bins: how many of each bin value there are (else NULL) */
} Ctx;

typedef struct {
    double t, bnd, L, U;
    const int16_t *used; /* limited bins: the bin values the row's ancestors took */
    int nused;
} Row;

typedef struct {
    double lo, hi;
} Bounds;

static const double NEG = -HUGE_VAL, POS = HUGE_VAL;
/* windows widen by this much where they pass to a child or meet a join (exact.py WINDOW_SLACK) */
static const double SLACK = 1e-12;

static inline double dmax(double a, double b) { return a > b ? a : b; }
static inline double dmin(double a, double b) { return a < b ? a : b; }

/* how many entries precede x: below it (right = 0), or not above it (right = 1); branchless */
static inline int precedes(double entry, double x, int right) { return right ? entry <= x : entry < x; }

static inline Py_ssize_t bisect(const double *v, Py_ssize_t n, double x, int right) {
    if (n == 0) return 0;
    if (x != x) return n; /* NaN sorts last, as in numpy */
    const double *base = v;
    Py_ssize_t len = n;
    while (len > 1) {
        Py_ssize_t half = len >> 1;
        base = precedes(base[half], x, right) ? base + half : base;
        len -= half;
    }
    return (base - v) + precedes(*base, x, right);
}

/* numpy.searchsorted(v, x, side="left") and side="right" */
static inline Py_ssize_t lower_bound(const double *v, Py_ssize_t n, double x) { return bisect(v, n, x, 0); }
static inline Py_ssize_t upper_bound(const double *v, Py_ssize_t n, double x) { return bisect(v, n, x, 1); }

/* lower_bound(v, n, x) found from a nearby index: exponential steps away from `hint`, then
 * bisection; about 2 log2(distance) probes, all near the last answer (cache-warm). */
static inline Py_ssize_t gallop_lower(const double *v, Py_ssize_t n, double x, Py_ssize_t hint) {
    if (x != x) return n;
    Py_ssize_t lo, hi, step = 1; /* the answer lies in (lo, hi]: v[lo] < x (or lo = -1), v[hi] >= x (or hi = n) */
    if (hint >= n || (hint >= 0 && v[hint] >= x)) {
        hi = hint >= n ? n : hint;
        lo = hi - 1;
        while (lo >= 0 && v[lo] >= x) {
            hi = lo;
            lo -= step;
            step <<= 1;
        }
        if (lo < -1) lo = -1;
    } else {
        lo = hint < 0 ? -1 : hint;
        hi = lo + 1;
        while (hi < n && v[hi] < x) {
            lo = hi;
            hi += step;
            step <<= 1;
        }
        if (hi > n) hi = n;
    }
    while (hi - lo > 1) {
        Py_ssize_t mid = lo + ((hi - lo) >> 1);
        if (v[mid] < x) lo = mid;
        else hi = mid;
    }
    return hi;
}

/*
 * lower_bound and upper_bound on a table, through its index when it has one. The bits of a
 * positive double, read as an integer, grow with its value, so the key bits >> shift (the
 * exponent and the leading mantissa bits) splits the table into runs of equal key: every entry
 * of a smaller key is smaller than x, every entry of a larger one larger, and the answer lies
 * within x's own run, a few entries long. Two loads (index, run) instead of ~20 bisection steps.
 */
static inline Py_ssize_t run_of(const Tab *t, double x, Py_ssize_t *hi) {
    int64_t bits;
    memcpy(&bits, &x, sizeof bits);
    long long k = (long long)(bits >> t->shift) - t->kmin;
    *hi = t->idx[k + 1];
    return t->idx[k];
}

static inline Py_ssize_t tab_lower(const Tab *t, double x) {
    if (t->idx == NULL || t->n == 0) return lower_bound(t->v, t->n, x);
    if (!(x > t->v[0])) return x != x ? t->n : 0;
    if (x > t->v[t->n - 1]) return t->n;
    Py_ssize_t hi, lo = run_of(t, x, &hi);
    return lo + lower_bound(t->v + lo, hi - lo, x);
}

static inline Py_ssize_t tab_upper(const Tab *t, double x) {
    if (t->idx == NULL || t->n == 0) return upper_bound(t->v, t->n, x);
    if (!(x >= t->v[0])) return x != x ? t->n : 0;
    if (x >= t->v[t->n - 1]) return t->n;
    Py_ssize_t hi, lo = run_of(t, x, &hi);
    return lo + upper_bound(t->v + lo, hi - lo, x);
}

static inline const Tab *non(const Ctx *c, int op, int n) {
    return op == OP_SERIES ? &c->par[n] : &c->ser[n];
}

static inline double join(int op, double a, double x) {
    if (op == OP_SERIES) return a + x;
    return (a * x) / (a + x);
}

/* the x at which a ∥ x equals edge, the edge widened by SLACK of its conductance (widen +1 for a
 * lower edge, -1 for an upper one); `none` where no x does (exact.py _par_child) */
static inline double par_child(double edge, double a, double none, int widen) {
    if (!(isfinite(edge) && edge > 0)) return none;
    double g = 1.0 / edge - 1.0 / a + widen * SLACK / edge;
    return g > 0 ? 1.0 / g : POS;
}

/* the target for x such that a ∥ x lands on t (exact.py _child_target) */
static inline double par_target(double t, double a) {
    if (t <= 0) return t;
    double g = 1.0 / t - 1.0 / a;
    return g > 0 ? 1.0 / g : POS;
}

/* drop a floor below a series bound, or a ceil above a parallel bound (exact.py _bound_filter) */
static inline Bounds bound_filter(int op, Row r, Bounds b) {
    if (op == OP_SERIES) {
        if (!(b.lo >= r.bnd && r.bnd <= r.t)) b.lo = NEG;
    } else {
        if (!(b.hi <= r.bnd && r.bnd >= r.t)) b.hi = POS;
    }
    return b;
}

/* may entry i of tb be taken beside the row's used parts? (tables.py compatible) */
static int fits(const Ctx *c, const Tab *tb, Py_ssize_t i, const Row *r) {
    const int16_t *p = tb->parts + i * tb->width;
    for (int j = 0; j < tb->width; j++) {
        int16_t v = p[j];
        if (v < 0) continue;
        long long taken = 0;
        for (int k = 0; k < tb->width; k++) taken += p[k] == v;
        for (int k = 0; k < r->nused; k++) taken += r->used[k] == v;
        if (taken > c->limits[v]) return 0;
    }
    return 1;
}

/* step i in direction `step` to the first entry that fits; give up (off the table) once the
 * value passes `stop_at`, beyond which no entry matters (exact.py _scan) */
static Py_ssize_t scan(const Ctx *c, const Tab *tb, Py_ssize_t i, int step, double stop_at, const Row *r) {
    while (i >= 0 && i < tb->n && !fits(c, tb, i, r)) {
        i += step;
        if (i < 0 || i >= tb->n) break;
        if (step < 0 ? tb->v[i] < stop_at : tb->v[i] > stop_at) return step < 0 ? -1 : tb->n;
    }
    return i;
}

static Bounds lookup(Ctx *c, const Tab *tb, int op, Row r, int bounded) {
    Bounds out = {NEG, POS};
    c->looked++;
    Py_ssize_t size = tb->n;
    const double *v = tb->v;
    if (size == 0) return out;
    double tf = r.t, tc = r.t;
    if (bounded) {
        if (op == OP_SERIES) tc = dmax(r.t, r.bnd);
        else tf = dmin(r.t, r.bnd);
    }
    Py_ssize_t ihi = tab_lower(tb, tc);
    Py_ssize_t ilo;
    if (tf == tc) /* one search: the floor is the entry at ihi when it equals t, else the one before */
        ilo = (ihi < size && v[ihi] == tf) ? ihi : ihi - 1;
    else
        ilo = tab_upper(tb, tf) - 1;
    if (c->limits != NULL) {
        double lo_stop = bounded && op == OP_SERIES ? dmax(r.L, r.bnd) : r.L;
        double hi_stop = bounded && op == OP_PARALLEL ? dmin(r.U, r.bnd) : r.U;
        ilo = scan(c, tb, ilo, -1, lo_stop - SLACK * fabs(lo_stop), &r);
        ihi = scan(c, tb, ihi, +1, hi_stop + SLACK * fabs(hi_stop), &r);
    }
    if (ilo >= 0) out.lo = v[ilo];
    if (ihi < size) out.hi = v[ihi];
    if (bounded) out = bound_filter(op, r, out);
    return out;
}

static Bounds nodes(Ctx *c, int op, int n, int m, Row r);

/* floor and ceil over x of n parts that may follow an ⊕ child of m parts (exact.py _family) */
static Bounds family(Ctx *c, int op, int n, int m, Row r) {
    if (n <= c->h) {
        const Tab *tb = (2 * m > n) ? non(c, op, n) : &c->any[n];
        return lookup(c, tb, op, r, n == m);
    }
    int other = op == OP_SERIES ? OP_PARALLEL : OP_SERIES;
    Row rr = r;
    rr.bnd = other == OP_SERIES ? NEG : POS;
    Bounds res;
    if (n == m) {
        rr.t = op == OP_SERIES ? dmax(r.t, r.bnd) : dmin(r.t, r.bnd);
        res = bound_filter(op, r, nodes(c, other, n, 1, rr));
    } else {
        res = nodes(c, other, n, 1, rr);
    }
    if (2 * m <= n) {
        Row r2 = r;
        r2.L = dmax(r.L, res.lo);
        r2.U = dmin(r.U, res.hi);
        Bounds b = nodes(c, op, n, m, r2);
        res.lo = dmax(res.lo, b.lo);
        res.hi = dmin(res.hi, b.hi);
    }
    return res;
}

/*
 * A split whose x comes from a table: the same as family()'s lookup for each a in turn, made
 * BLOCK at a time. When the a's are about as many as the table's entries, each search gallops
 * from the last answer; else each goes through the table's index (tab_lower), or, for a table
 * without one, the BLOCK binary searches advance in step (a lone branchless search waits on one
 * load per step; BLOCK independent ones keep that many loads in flight). A look-up reads no
 * window, so batching them changes no answer.
 */
#define BLOCK 16
/* gallop when the a's are at least 1/NEAR_RATIO as many as the x table's entries */
#define NEAR_RATIO 16

static void leaf_split(Ctx *c, int op, int same, double xmin, const double *v, Py_ssize_t start, Py_ssize_t stop,
                       const Tab *xt, Row r, Bounds *res) {
    const double *x = xt->v;
    Py_ssize_t size = xt->n;
    double tc[BLOCK], tf[BLOCK], as[BLOCK];
    const double *base[BLOCK];
    Py_ssize_t idx[BLOCK], hint = size / 2;
    /* the a's span about as many x entries as there are a's, or fewer: gallop; else bisect in blocks */
    int near = (stop - start) * NEAR_RATIO >= size;
    for (Py_ssize_t i = start; i < stop; i += BLOCK) {
        double U = dmin(r.U, res->hi);
        int k = 0, done = 0;
        for (; k < BLOCK && i + k < stop; k++) {
            double a = v[i + k];
            /* as in split(): x of the same size is not below a (series); the least x else is xmin */
            double least = op == OP_SERIES ? a + (same ? dmax(xmin, a) : xmin) : a * xmin / (a + xmin);
            if (least > U + SLACK * fabs(U)) {
                done = 1;
                break;
            }
            double t = op == OP_SERIES ? r.t - a : par_target(r.t, a);
            as[k] = a;
            tc[k] = tf[k] = t;
            if (same) { /* bounded: x is not below a (series) nor above it (parallel) */
                if (op == OP_SERIES) tc[k] = dmax(t, a);
                else tf[k] = dmin(t, a);
            }
        }
        c->looked += k;
        if (size == 0) {
            if (done) break;
            continue;
        }
        if (near) { /* consecutive targets lie close together in x: walk from the last answer */
            for (int j = 0; j < k; j++) hint = idx[j] = gallop_lower(x, size, tc[j], hint);
        } else if (xt->idx != NULL) {
            for (int j = 0; j < k; j++) idx[j] = tab_lower(xt, tc[j]);
        } else {
            for (int j = 0; j < k; j++) base[j] = x;
            Py_ssize_t len = size;
            while (len > 1) {
                Py_ssize_t half = len >> 1;
                for (int j = 0; j < k; j++) base[j] = (base[j][half] < tc[j]) ? base[j] + half : base[j];
                len -= half;
            }
            for (int j = 0; j < k; j++) idx[j] = tc[j] != tc[j] ? size : (base[j] - x) + (*base[j] < tc[j]);
        }
        for (int j = 0; j < k; j++) {
            double a = as[j];
            Py_ssize_t ihi = idx[j];
            Py_ssize_t ilo;
            if (tf[j] == tc[j])
                ilo = (ihi < size && x[ihi] == tf[j]) ? ihi : ihi - 1;
            else
                ilo = tab_upper(xt, tf[j]) - 1;
            Bounds b = {ilo >= 0 ? x[ilo] : NEG, ihi < size ? x[ihi] : POS};
            if (same) {
                Row sub = {tc[j] == tf[j] ? tc[j] : (op == OP_SERIES ? tf[j] : tc[j]), a, 0, 0};
                b = bound_filter(op, sub, b);
            }
            if (isfinite(b.lo)) res->lo = dmax(res->lo, join(op, a, b.lo));
            if (isfinite(b.hi)) res->hi = dmin(res->hi, join(op, a, b.hi));
        }
        if (done) break;
    }
}

/*
 * The same pairs as leaf_split() over the a's of `as` (n entries, ascending, all on the
 * target's near side), taken the other way round: for each x that could bring a ⊕ x into the
 * window, the nearest a on either side of x's partner target. Worth it when fewer x than a
 * can matter: a series target t is met by x = t − a, and the many small a's all ask for x just
 * below t. Returns 0, doing nothing, when it would not save look-ups.
 *
 * Pair sets: a ⊕ x ≤ t ⇔ a ≤ (partner target of x), as a ⊕ x ≤ t ⇔ x ≤ (partner target of a)
 * in leaf_split(); the same-size bound (series x ≥ a, parallel x ≤ a) is checked on each pair.
 */
static int swapped_split(Ctx *c, int op, int same, const double *as, Py_ssize_t n, const Tab *xt, Row r,
                         Bounds *res) {
    const double *x = xt->v;
    Py_ssize_t size = xt->n;
    double L = dmax(r.L, res->lo), U = dmin(r.U, res->hi);
    double first = as[0], last = as[n - 1];
    Py_ssize_t x0, x1;
    if (op == OP_SERIES) {
        x0 = tab_lower(xt, same ? dmax(L - last - SLACK * fabs(L), first) : L - last - SLACK * fabs(L));
        x1 = tab_upper(xt, U - first + SLACK * fabs(U));
    } else {
        x0 = tab_lower(xt, par_child(L, last, NEG, +1));
        double top = par_child(U, first, POS, -1);
        x1 = tab_upper(xt, same ? dmin(top, last) : top);
    }
    if (x1 - x0 < 0) x1 = x0;
    if ((x1 - x0) * 2 >= n) return 0;
    c->looked += x1 - x0;
    Py_ssize_t hint = n - 1;
    for (Py_ssize_t i = x0; i < x1; i++) {
        double xv = x[i];
        double q = op == OP_SERIES ? r.t - xv : par_target(r.t, xv);
        double qf = q, qc = q; /* the floor takes the largest a <= qf, the ceil the smallest a >= qc */
        if (same) {
            if (op == OP_SERIES) qf = dmin(q, xv);
            else qc = dmax(q, xv);
        }
        Py_ssize_t ci = hint = gallop_lower(as, n, qc, hint);
        Py_ssize_t fi = qf == qc ? ((ci < n && as[ci] == qf) ? ci : ci - 1) : upper_bound(as, n, qf) - 1;
        if (fi >= 0 && !(same && op == OP_PARALLEL && as[fi] < xv)) res->lo = dmax(res->lo, join(op, as[fi], xv));
        if (ci < n && !(same && op == OP_SERIES && as[ci] > xv)) res->hi = dmin(res->hi, join(op, as[ci], xv));
    }
    return 1;
}

static Bounds family(Ctx *c, int op, int n, int m, Row r);

/* a ⊕ (the family of x of n2 parts that may follow a), folded into res; `used`: the parts the
 * row's ancestors and a take (limited bins) */
static void fold_child(Ctx *c, int op, int n2, int n1, double a, Row r, const int16_t *used, int nused,
                       Bounds *res) {
    double L = dmax(r.L, res->lo), U = dmin(r.U, res->hi);
    Row sub;
    sub.bnd = a;
    sub.used = used;
    sub.nused = nused;
    if (op == OP_SERIES) {
        sub.t = r.t - a;
        sub.L = L - a - SLACK * fabs(L);
        sub.U = U - a + SLACK * fabs(U);
    } else {
        sub.t = par_target(r.t, a);
        sub.L = par_child(L, a, NEG, +1);
        sub.U = par_child(U, a, POS, -1);
    }
    Bounds ch = family(c, op, n2, n1, sub);
    if (isfinite(ch.lo)) res->lo = dmax(res->lo, join(op, a, ch.lo));
    if (isfinite(ch.hi)) res->hi = dmin(res->hi, join(op, a, ch.hi));
}

/* one child a (entry i of tb) of a limited split, if it fits beside the row's parts */
static void limited_child(Ctx *c, int op, int n2, int n1, const Tab *tb, Py_ssize_t i, Row r, Bounds *res) {
    int16_t used[MAX_PARTS];
    if (r.nused + tb->width > MAX_PARTS || !fits(c, tb, i, &r)) return;
    memcpy(used, r.used, sizeof(int16_t) * (size_t)r.nused);
    memcpy(used + r.nused, tb->parts + i * tb->width, sizeof(int16_t) * (size_t)tb->width);
    fold_child(c, op, n2, n1, tb->v[i], r, used, r.nused + tb->width, res);
}

/*
 * A split on a limited bin (exact.py "Stock limits"). The boundary argument does not hold here
 * (which x may follow a depends on the parts a takes), so instead of one boundary entry every a
 * beyond it is visited while a ⊕ x could still land in the narrowing window: series a ascending
 * until a + (least x) passes above it; parallel a descending below the boundary until
 * a ∥ (largest x) falls below it. Each a must fit beside the row's parts; so must each x (scan).
 */
static int limited_swapped(Ctx *c, int op, int n2, int n1, int same, double xmin, double xmax, const Tab *tb,
                           Py_ssize_t start, Py_ssize_t stop, Py_ssize_t full, Row r, Bounds *res);

static void limited_split(Ctx *c, int op, int n2, int n1, int same, double xmin, double xmax, const Tab *tb,
                          Py_ssize_t start, Py_ssize_t stop, Py_ssize_t full, Row r, Bounds *res) {
    const double *v = tb->v;
    if (n2 <= c->h && limited_swapped(c, op, n2, n1, same, xmin, xmax, tb, start, stop, full, r, res)) return;
    if (op == OP_SERIES) {
        for (Py_ssize_t i = start; i < tb->n; i++) {
            if (*c->stop) return;
            double a = v[i], U = dmin(r.U, res->hi);
            if (a + (same ? dmax(xmin, a) : xmin) > U + SLACK * fabs(U)) break;
            limited_child(c, op, n2, n1, tb, i, r, res);
        }
    } else {
        for (Py_ssize_t i = full; i < stop; i++) {
            if (*c->stop) return;
            double a = v[i], U = dmin(r.U, res->hi);
            if (a * xmin / (a + xmin) > U + SLACK * fabs(U)) break;
            limited_child(c, op, n2, n1, tb, i, r, res);
        }
        for (Py_ssize_t i = full - 1; i >= 0; i--) {
            if (*c->stop) return;
            double a = v[i], L = dmax(r.L, res->lo);
            double x = same ? dmin(xmax, a) : xmax;
            if (a * x / (a + x) < L - SLACK * fabs(L)) break; /* smaller a land lower still */
            limited_child(c, op, n2, n1, tb, i, r, res);
        }
    }
    (void)stop;
}

/*
 * limited_split()'s pairs taken x-first, as swapped_split() does for unlimited bins, where fewer x
 * than a can matter. The a visited are one run of the table: series from `start` while
 * a + (least x) stays within the window; parallel from the first a whose a ∥ (largest x) reaches
 * it up to `stop`. For each x that fits beside the row's parts, the nearest a on either side of
 * its partner target that fits beside both is found by stepping past those that would overdraw,
 * up to where a ⊕ x leaves the window. Returns 0, doing nothing, when it would not save work.
 */
static int limited_swapped(Ctx *c, int op, int n2, int n1, int same, double xmin, double xmax, const Tab *tb,
                           Py_ssize_t start, Py_ssize_t stop, Py_ssize_t full, Row r, Bounds *res) {
    const Tab *xt = (2 * n1 > n2) ? non(c, op, n2) : &c->any[n2];
    const double *v = tb->v, *x = xt->v;
    double L = dmax(r.L, res->lo), U = dmin(r.U, res->hi);
    double Lw = L - SLACK * fabs(L), Uw = U + SLACK * fabs(U);
    Py_ssize_t ia0, ia1, lo_i, hi_i;
    if (op == OP_SERIES) { /* a + least(a) <= Uw, least(a) = max(xmin, a) for the same size, else xmin */
        ia0 = start;
        ia1 = same ? (Uw / 2 >= xmin ? tab_upper(tb, Uw / 2) : tab_upper(tb, Uw - xmin)) : tab_upper(tb, Uw - xmin);
    } else { /* a ∥ most(a) >= Lw, most(a) = min(xmax, a) for the same size, else xmax */
        double g = 1.0 / Lw - 1.0 / xmax;
        double edge = g > 0 ? 1.0 / g : POS; /* a ∥ xmax >= Lw from here on */
        ia0 = same ? (2 * Lw <= xmax ? tab_lower(tb, 2 * Lw) : tab_lower(tb, edge)) : tab_lower(tb, edge);
        if (!(Lw > 0)) ia0 = 0;
        ia1 = stop;
        (void)full;
    }
    if (ia1 - ia0 < 2) return 0;
    const double *as = v + ia0;
    Py_ssize_t n = ia1 - ia0;
    double first = as[0], last = as[n - 1];
    if (op == OP_SERIES) {
        lo_i = tab_lower(xt, same ? dmax(Lw - last, first) : Lw - last);
        hi_i = tab_upper(xt, Uw - first);
    } else {
        lo_i = tab_lower(xt, par_child(L, last, NEG, +1));
        double top = par_child(U, first, POS, -1);
        hi_i = tab_upper(xt, same ? dmin(top, last) : top);
    }
    if (hi_i < lo_i) hi_i = lo_i;
    if ((hi_i - lo_i) * 2 >= n) return 0;
    c->looked += hi_i - lo_i;
    Tab sub = *tb; /* the a's as a table of their own, for fits() */
    sub.v = as;
    sub.n = n;
    sub.parts = tb->parts + ia0 * tb->width;
    sub.idx = NULL;
    int16_t used[MAX_PARTS];
    if (r.nused + xt->width > MAX_PARTS) return 0;
    memcpy(used, r.used, sizeof(int16_t) * (size_t)r.nused);
    Row both = r;
    both.used = used;
    both.nused = r.nused + xt->width;
    Py_ssize_t hint = n - 1;
    for (Py_ssize_t i = lo_i; i < hi_i; i++) {
        if (*c->stop) return 1;
        if (!fits(c, xt, i, &r)) continue;
        double xv = x[i];
        memcpy(used + r.nused, xt->parts + i * xt->width, sizeof(int16_t) * (size_t)xt->width);
        double q = op == OP_SERIES ? r.t - xv : par_target(r.t, xv);
        double qf = q, qc = q;
        if (same) {
            if (op == OP_SERIES) qf = dmin(q, xv);
            else qc = dmax(q, xv);
        }
        L = dmax(r.L, res->lo);
        U = dmin(r.U, res->hi);
        /* a ⊕ x leaves the window below these a (floor side) and above these (ceil side) */
        double a_low = op == OP_SERIES ? L - xv - SLACK * fabs(L) : par_child(L, xv, NEG, +1);
        double a_high = op == OP_SERIES ? U - xv + SLACK * fabs(U) : par_child(U, xv, POS, -1);
        Py_ssize_t ci = hint = gallop_lower(as, n, qc, hint);
        Py_ssize_t fi = qf == qc ? ((ci < n && as[ci] == qf) ? ci : ci - 1) : upper_bound(as, n, qf) - 1;
        fi = scan(c, &sub, fi, -1, a_low, &both);
        ci = scan(c, &sub, ci, +1, a_high, &both);
        if (fi >= 0 && !(same && op == OP_PARALLEL && as[fi] < xv)) res->lo = dmax(res->lo, join(op, as[fi], xv));
        if (ci < n && !(same && op == OP_SERIES && as[ci] > xv)) res->hi = dmin(res->hi, join(op, as[ci], xv));
    }
    return 1;
}

/* fold the ⊕ nodes of one split (a of n1 parts, x of n − n1) into res (exact.py _split) */
static void split(Ctx *c, int op, int n, int n1, int m, Row r, Bounds *res) {
    int n2 = n - n1;
    const Tab *tb = non(c, op, n1);
    const double *v = tb->v;
    Py_ssize_t size = tb->n;
    if (size == 0) return;
    int same = n1 == n2;
    double cc = same ? 2.0 : 1.0;
    int bounded = n1 == m;
    double xmin = c->vmin / n2, xmax = c->vmax * n2;
    double L = dmax(r.L, res->lo), U = dmin(r.U, res->hi);
    Py_ssize_t start, stop, full;
    if (op == OP_SERIES) {
        double low = L - xmax - SLACK * fabs(L);
        if (bounded) low = dmax(low, r.bnd);
        start = tab_lower(tb, low);
        full = tab_lower(tb, r.t / cc);
        if (full < start) full = start;
        Py_ssize_t b = full < size - 1 ? full : size - 1;
        double least = v[b] + dmax(xmin, same ? v[b] : 0.0);
        stop = full + ((full < size) && (least <= U + SLACK * fabs(U)));
    } else {
        double g = 1.0 / U - 1.0 / xmin - SLACK / U;
        double high = g > 0 ? 1.0 / g : POS;
        if (bounded) high = dmin(high, r.bnd);
        stop = tab_upper(tb, high);
        full = tab_upper(tb, r.t * cc);
        if (full > stop) full = stop;
        Py_ssize_t b = full - 1 > 0 ? full - 1 : 0;
        double x = same ? dmin(xmax, v[b]) : xmax;
        double most = v[b] * x / (v[b] + x);
        start = full - ((full > 0) && (most >= L - SLACK * fabs(L)));
    }
    if (c->limits != NULL) {
        limited_split(c, op, n2, n1, same, xmin, xmax, tb, start, stop, full, r, res);
        return;
    }
    if (n2 <= c->h) {
        const Tab *xt = (2 * n1 > n2) ? non(c, op, n2) : &c->any[n2];
        /* the entries on the target's near side (series: a < t/c; parallel: a > t·c), and the boundary */
        Py_ssize_t i0 = op == OP_SERIES ? start : full, i1 = op == OP_SERIES ? full : stop;
        if (i1 - i0 > 1 && swapped_split(c, op, same, v + i0, i1 - i0, xt, r, res)) {
            if (op == OP_SERIES) leaf_split(c, op, same, xmin, v, full, stop, xt, r, res);
            else leaf_split(c, op, same, xmin, v, start, full, xt, r, res);
        } else {
            leaf_split(c, op, same, xmin, v, start, stop, xt, r, res);
        }
        return;
    }
    for (Py_ssize_t i = start; i < stop; i++) {
        if (*c->stop) return; /* the answer is thrown away */
        double a = v[i];
        U = dmin(r.U, res->hi);
        double least = op == OP_SERIES ? a + (same ? dmax(xmin, a) : xmin) : a * xmin / (a + xmin);
        if (least > U + SLACK * fabs(U)) break; /* both joins grow with a: later a land higher still */
        fold_child(c, op, n2, n1, a, r, NULL, 0, res);
    }
}

/* floor and ceil over ⊕ nodes of n parts whose children all have at least m parts (exact.py _nodes) */
static Bounds nodes(Ctx *c, int op, int n, int m, Row r) {
    Bounds res = {NEG, POS};
    for (int n1 = m; n1 <= n / 2; n1++) split(c, op, n, n1, m, r, &res);
    return res;
}

/* ------------------------------------------------------------------ Python glue */

typedef struct {
    Py_buffer buf[9 * (MAX_LEVEL + 1)];
    int held;
} Buffers;

static void release_all(Buffers *b) {
    for (int i = 0; i < b->held; i++) PyBuffer_Release(&b->buf[i]);
    b->held = 0;
}

static int get_doubles(PyObject *obj, Buffers *held, Py_buffer *view, const char *name, int writable) {
    int flags = PyBUF_C_CONTIGUOUS | PyBUF_FORMAT | (writable ? PyBUF_WRITABLE : 0);
    if (PyObject_GetBuffer(obj, view, flags) < 0) return -1;
    if (view->itemsize != 8 || view->format == NULL || strcmp(view->format, "d") != 0) {
        PyErr_Format(PyExc_TypeError, "%s: a contiguous float64 array is needed", name);
        PyBuffer_Release(view);
        return -1;
    }
    (void)held;
    return 0;
}

PyDoc_STRVAR(bounds_doc,
"bounds(tables, vmin, vmax, what, op, n, m, t, bnd, L, U, lo, hi, offset, stride, stop, limits, used)\n\n"
"Floor and ceil, written into ``lo`` and ``hi``, for the rows offset, offset + stride, ...\n"
"``tables``: for each level 1..h, the (ser, par, any) tables, each (values, index, kmin, shift,\n"
"parts): sorted float64 values, an int32 index by leading bits (or None; see tab_lower), and\n"
"for a limited bin the int16 bin-value indices of each entry's parts (or None).\n"
"``limits`` (int64 per bin value) and ``used`` (int16, one row per query row) for a limited bin,\n"
"else None and None.\n"
"``what`` 0: the family of x that may follow an op child of m parts (exact.py _family);\n"
"1: op nodes of n parts whose children all have at least m parts (exact.py _nodes).\n"
"``stop``: an int32 array; setting its first item from another thread ends the call soon (the\n"
"results are then meaningless). Releases the GIL while it runs; returns the look-ups made.");

static PyObject *py_bounds(PyObject *self, PyObject *args) {
    PyObject *tables, *ot, *obnd, *oL, *oU, *olo, *ohi, *ostop, *olimits, *oused;
    double vmin, vmax;
    int what, op, n, m;
    Py_ssize_t offset, stride;
    (void)self;
    if (!PyArg_ParseTuple(args, "O!ddiiiiOOOOOOnnOOO", &PyTuple_Type, &tables, &vmin, &vmax, &what, &op, &n, &m,
                          &ot, &obnd, &oL, &oU, &olo, &ohi, &offset, &stride, &ostop, &olimits, &oused))
        return NULL;
    Py_ssize_t h = PyTuple_GET_SIZE(tables);
    if (h < 1 || h > MAX_LEVEL || n < 1 || n > MAX_PARTS || m < 1 || m > n || stride < 1 || offset < 0 ||
        (op != OP_SERIES && op != OP_PARALLEL) || (what != 0 && what != 1)) {
        PyErr_SetString(PyExc_ValueError, "bounds: an argument is out of range");
        return NULL;
    }
    Ctx *c = PyMem_Calloc(1, sizeof(Ctx));
    Buffers *held = PyMem_Calloc(1, sizeof(Buffers));
    Py_buffer rows[6], stopbuf, limbuf, usedbuf;
    int nrows_held = 0, stop_held = 0, lim_held = 0, used_held = 0;
    const int16_t *used = NULL;
    Py_ssize_t used_width = 0;
    PyObject *result = NULL;
    if (c == NULL || held == NULL) {
        PyErr_NoMemory();
        goto done;
    }
    if (PyObject_GetBuffer(ostop, &stopbuf, PyBUF_C_CONTIGUOUS | PyBUF_FORMAT) < 0) goto done;
    stop_held = 1;
    if (stopbuf.itemsize != 4 || stopbuf.len < 4 || stopbuf.format == NULL || strcmp(stopbuf.format, "i") != 0) {
        PyErr_SetString(PyExc_TypeError, "bounds: stop is an int32 array");
        goto done;
    }
    c->stop = (volatile const int32_t *)stopbuf.buf;
    c->h = (int)h;
    c->vmin = vmin;
    c->vmax = vmax;
    for (Py_ssize_t lv = 0; lv < h; lv++) {
        PyObject *level = PyTuple_GET_ITEM(tables, lv);
        if (!PyTuple_Check(level) || PyTuple_GET_SIZE(level) != 3) {
            PyErr_SetString(PyExc_TypeError, "bounds: each level is a (ser, par, any) tuple");
            goto done;
        }
        Tab *dest[3] = {&c->ser[lv + 1], &c->par[lv + 1], &c->any[lv + 1]};
        for (int k = 0; k < 3; k++) {
            PyObject *spec = PyTuple_GET_ITEM(level, k);
            PyObject *values, *index, *parts;
            long long kmin;
            int shift;
            if (!PyArg_ParseTuple(spec, "OOLiO", &values, &index, &kmin, &shift, &parts)) goto done;
            Py_buffer *view = &held->buf[held->held];
            if (get_doubles(values, held, view, "table", 0) < 0) goto done;
            held->held++;
            dest[k]->v = (const double *)view->buf;
            dest[k]->n = view->len / 8;
            dest[k]->idx = NULL;
            dest[k]->parts = NULL;
            dest[k]->width = 0;
            if (parts != Py_None) {
                Py_buffer *pv = &held->buf[held->held];
                if (PyObject_GetBuffer(parts, pv, PyBUF_C_CONTIGUOUS | PyBUF_FORMAT | PyBUF_ND) < 0) goto done;
                held->held++;
                if (pv->itemsize != 2 || pv->ndim != 2 || pv->shape[0] != dest[k]->n || pv->shape[1] != lv + 1 ||
                    pv->format == NULL || strcmp(pv->format, "h") != 0) {
                    PyErr_SetString(PyExc_TypeError, "bounds: a table's parts are an int16 array, one row per entry");
                    goto done;
                }
                dest[k]->parts = (const int16_t *)pv->buf;
                dest[k]->width = (int)(lv + 1);
            }
            if (index != Py_None) {
                Py_buffer *iv = &held->buf[held->held];
                if (PyObject_GetBuffer(index, iv, PyBUF_C_CONTIGUOUS | PyBUF_FORMAT) < 0) goto done;
                held->held++;
                if (iv->itemsize != 4 || iv->format == NULL || strcmp(iv->format, "i") != 0 || shift < 0 ||
                    shift > 62 || dest[k]->n == 0) {
                    PyErr_SetString(PyExc_TypeError, "bounds: a table index is an int32 array of a non-empty table");
                    goto done;
                }
                dest[k]->idx = (const int32_t *)iv->buf;
                dest[k]->kmin = kmin;
                dest[k]->shift = shift;
                /* the index must cover every key from the first entry's to the last's */
                int64_t first, last;
                memcpy(&first, &dest[k]->v[0], 8);
                memcpy(&last, &dest[k]->v[dest[k]->n - 1], 8);
                if (dest[k]->v[0] <= 0 || (first >> shift) != kmin ||
                    iv->len / 4 != (Py_ssize_t)((last >> shift) - kmin + 2)) {
                    PyErr_SetString(PyExc_ValueError, "bounds: a table index does not match its table");
                    goto done;
                }
            }
        }
    }
    PyObject *objs[6] = {ot, obnd, oL, oU, olo, ohi};
    for (int k = 0; k < 6; k++) {
        if (get_doubles(objs[k], held, &rows[k], "rows", k >= 4) < 0) goto done;
        nrows_held++;
    }
    Py_ssize_t count = rows[0].len / 8;
    for (int k = 1; k < 6; k++) {
        if (rows[k].len / 8 != count) {
            PyErr_SetString(PyExc_ValueError, "bounds: the row arrays differ in length");
            goto done;
        }
    }
    if (olimits != Py_None) { /* a limited bin: every table has its parts, every row its used values */
        if (PyObject_GetBuffer(olimits, &limbuf, PyBUF_C_CONTIGUOUS | PyBUF_FORMAT) < 0) goto done;
        lim_held = 1;
        if (PyObject_GetBuffer(oused, &usedbuf, PyBUF_C_CONTIGUOUS | PyBUF_FORMAT | PyBUF_ND) < 0) goto done;
        used_held = 1;
        if (limbuf.itemsize != 8 || (strcmp(limbuf.format, "q") != 0 && strcmp(limbuf.format, "l") != 0) ||
            usedbuf.itemsize != 2 || usedbuf.ndim != 2 || usedbuf.shape[0] != count || usedbuf.shape[1] > MAX_PARTS ||
            strcmp(usedbuf.format, "h") != 0) {
            PyErr_SetString(PyExc_TypeError, "bounds: limits are int64, used is int16 (rows, taken)");
            goto done;
        }
        for (Py_ssize_t lv = 1; lv <= h; lv++) {
            if (c->ser[lv].parts == NULL || c->par[lv].parts == NULL || c->any[lv].parts == NULL) {
                PyErr_SetString(PyExc_TypeError, "bounds: a limited bin's tables need their parts");
                goto done;
            }
        }
        c->limits = (const int64_t *)limbuf.buf;
        used = (const int16_t *)usedbuf.buf;
        used_width = usedbuf.shape[1];
    }
    const double *t = rows[0].buf, *bnd = rows[1].buf, *L = rows[2].buf, *U = rows[3].buf;
    double *lo = rows[4].buf, *hi = rows[5].buf;
    Py_BEGIN_ALLOW_THREADS
    for (Py_ssize_t i = offset; i < count && !*c->stop; i += stride) {
        Row r = {t[i], bnd[i], L[i], U[i], used ? used + i * used_width : NULL, (int)used_width};
        Bounds b = what == 0 ? family(c, op, n, m, r) : nodes(c, op, n, m, r);
        lo[i] = b.lo;
        hi[i] = b.hi;
    }
    Py_END_ALLOW_THREADS
    result = PyLong_FromLongLong(c->looked);
done:
    for (int k = 0; k < nrows_held; k++) PyBuffer_Release(&rows[k]);
    if (stop_held) PyBuffer_Release(&stopbuf);
    if (lim_held) PyBuffer_Release(&limbuf);
    if (used_held) PyBuffer_Release(&usedbuf);
    if (held) release_all(held);
    PyMem_Free(held);
    PyMem_Free(c);
    return result;
}

static PyMethodDef methods[] = {
    {"bounds", py_bounds, METH_VARARGS, bounds_doc},
    {NULL, NULL, 0, NULL},
};

static struct PyModuleDef module = {
    PyModuleDef_HEAD_INIT, "_kernel",
    "The exact search's inner recursion, compiled (see netsynth.search.kernel).", -1, methods,
};

PyMODINIT_FUNC PyInit__kernel(void) { return PyModule_Create(&module); }
