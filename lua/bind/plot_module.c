/*
 * The plot module (coldprep_plot.so, loaded on first use by require "coldprep.render",
 * module.c, so that a start does not open PLplot): coldprep.plot.render, figures drawn with
 * PLplot's Cairo drivers to PNG (pngcairo), SVG (svgcairo) or PDF (pdfcairo), chosen by the
 * file extension.  A figure
 * is a column of panels; a panel holds curves, bars over named categories, or a colour
 * map over a grid, plus optional horizontal reference lines.  The ready-made figures
 * (sweep curve, map, budget waterfall, Raman trace, band structure) are built on it in
 * lua/coldprep/plot.lua.
 *
 * PLplot ends the process on some errors (plexit), keeps global state and is not thread
 * safe, so every argument is read and checked before plinit (nothing can raise a Lua error
 * while PLplot is active), the device and the output file are checked first, and one
 * mutex serialises figures.
 */
#include <errno.h>
#include <lauxlib.h>
#include <lua.h>
#include <math.h>
#include <plplot.h>
#include <pthread.h>
#include <stdio.h>
#include <string.h>

#include "args.h"
#include "help.h"

/* The module's entry, found by name with dlsym (module.c, on the first use of cp.plot):
 * pushes the table {render = ...} with its help registered.  Declared here because no
 * header is shared with the loader, which knows the function by its name only. */
int luaopen_coldprep_plot(lua_State *L);

enum { MAX_PANELS = 6, MAX_LINES = 16, MAX_CATEGORIES = 64, MAX_HLINES = 8, COLOURS = 10 };

static const char *const FNAME = "plot.render";
static pthread_mutex_t plot_lock = PTHREAD_MUTEX_INITIALIZER;

typedef struct curve {
    const double *x, *y;
    size_t n;
    const char *label;
    int line, points, dashed;
} curve;

typedef struct panel {
    const char *title, *xlabel, *ylabel;
    int xlog, ylog;
    int has_ymin, has_ymax;
    double ymin, ymax;
    curve curves[MAX_LINES];
    int ncurves;
    const double *bars; /* values over categories 1..ncat */
    const char *bar_notes[MAX_CATEGORIES];
    size_t ncat;
    const char *categories[MAX_CATEGORIES]; /* names of x = 1..nlabels, instead of numbers */
    size_t nlabels;
    const double *mx, *my, *mz; /* map: z[j * nx + i] at (x[i], y[j]); NaN = no value */
    size_t nx, ny;
    const char *zlabel;
    int zlog;
    int legend_position; /* PL_POSITION_* flags */
    double hline[MAX_HLINES];
    const char *hline_label[MAX_HLINES];
    int nhlines;
} panel;

typedef struct figure {
    const char *out, *device, *title;
    long width, height;
    panel panels[MAX_PANELS];
    int npanels;
} figure;

/* ---- reading the arguments (may raise; nothing of PLplot's is live yet) -------------- */

static const char *opt_string_field(lua_State *L, int t, const char *key)
{
    lua_getfield(L, t, key);
    const char *s = NULL;
    if (lua_type(L, -1) == LUA_TSTRING)
        s = lua_tostring(L, -1); /* stays valid: the table holds the string */
    else if (!lua_isnil(L, -1))
        cpl_error(L, FNAME, "'%s' must be a string, got %s", key, luaL_typename(L, -1));
    lua_pop(L, 1);
    return s;
}

static int opt_bool_field(lua_State *L, int t, const char *key, int dflt)
{
    lua_getfield(L, t, key);
    int v = dflt;
    if (lua_isboolean(L, -1))
        v = lua_toboolean(L, -1);
    else if (!lua_isnil(L, -1))
        cpl_error(L, FNAME, "'%s' must be true or false, got %s", key, luaL_typename(L, -1));
    lua_pop(L, 1);
    return v;
}

/* An array of finite numbers t[key] (left in a userdata on the stack). */
static const double *array_field(lua_State *L, int t, const char *key, size_t *n)
{
    luaL_checkstack(L, 4, "too many plot arrays");
    return cpl_number_array(L, t, FNAME, key, "", 1, n);
}

static void check_positive(lua_State *L, const double *v, size_t n, const char *what)
{
    for (size_t i = 0; i < n; i++)
        if (!(v[i] > 0))
            cpl_error(L, FNAME, "%s[%d] = %g cannot be shown on a logarithmic axis (needs > 0)",
                      what, (int)i + 1, v[i]);
}

/* A list of strings t[key] (at most max) into out; returns the count. */
static size_t string_list(lua_State *L, int t, const char *key, const char **out, size_t max)
{
    lua_getfield(L, t, key);
    if (lua_isnil(L, -1)) {
        lua_pop(L, 1);
        return 0;
    }
    if (!lua_istable(L, -1))
        cpl_error(L, FNAME, "'%s' must be a list of strings", key);
    size_t n = lua_rawlen(L, -1);
    if (n > max)
        cpl_error(L, FNAME, "'%s' has %d entries; at most %d", key, (int)n, (int)max);
    for (size_t i = 0; i < n; i++) {
        lua_rawgeti(L, -1, (lua_Integer)i + 1);
        if (lua_type(L, -1) != LUA_TSTRING)
            cpl_error(L, FNAME, "%s[%d] must be a string", key, (int)i + 1);
        out[i] = lua_tostring(L, -1);
        lua_pop(L, 1);
    }
    lua_pop(L, 1);
    return n;
}

static void read_curves(lua_State *L, int pt, panel *p)
{
    static const char *const known[] = {"x", "y", "label", "line", "points", "dashed", NULL};
    lua_getfield(L, pt, "lines");
    if (lua_isnil(L, -1)) {
        lua_pop(L, 1);
        return;
    }
    int lt = lua_gettop(L);
    if (!lua_istable(L, lt) || lua_rawlen(L, lt) > MAX_LINES)
        cpl_error(L, FNAME, "'lines' must be a list of at most %d curves {x = ..., y = ...}", MAX_LINES);
    p->ncurves = (int)lua_rawlen(L, lt);
    for (int i = 0; i < p->ncurves; i++) {
        curve *c = &p->curves[i];
        lua_rawgeti(L, lt, i + 1);
        int ct = lua_gettop(L);
        cpl_check_args(L, ct, "plot.render (a curve)", known);
        size_t ny;
        c->x = array_field(L, ct, "x", &c->n);
        c->y = array_field(L, ct, "y", &ny);
        if (ny != c->n)
            cpl_error(L, FNAME, "curve %d has %d x values but %d y values", i + 1, (int)c->n, (int)ny);
        c->label = opt_string_field(L, ct, "label");
        c->line = opt_bool_field(L, ct, "line", 1);
        c->points = opt_bool_field(L, ct, "points", 0);
        c->dashed = opt_bool_field(L, ct, "dashed", 0);
        if (p->xlog)
            check_positive(L, c->x, c->n, "x");
        if (p->ylog)
            check_positive(L, c->y, c->n, "y");
        lua_remove(L, ct); /* the arrays stay on the stack above */
    }
    lua_remove(L, lt);
}

static void read_bars(lua_State *L, int pt, panel *p)
{
    static const char *const known[] = {"values", "categories", "notes", NULL};
    lua_getfield(L, pt, "bars");
    if (lua_isnil(L, -1)) {
        lua_pop(L, 1);
        return;
    }
    int bt = lua_gettop(L);
    cpl_check_args(L, bt, "plot.render (bars)", known);
    size_t n;
    p->bars = array_field(L, bt, "values", &n);
    if (n > MAX_CATEGORIES)
        cpl_error(L, FNAME, "at most %d bars", MAX_CATEGORIES);
    p->nlabels = string_list(L, bt, "categories", p->categories, MAX_CATEGORIES);
    if (p->nlabels != n)
        cpl_error(L, FNAME, "bars need one category name per value");
    size_t nn = string_list(L, bt, "notes", p->bar_notes, MAX_CATEGORIES);
    if (nn != 0 && nn != n)
        cpl_error(L, FNAME, "bars: give one note per value or none");
    p->ncat = n;
    if (p->ylog)
        check_positive(L, p->bars, n, "bars.values");
    lua_remove(L, bt);
}

static void read_map(lua_State *L, int pt, panel *p)
{
    static const char *const known[] = {"x", "y", "z", "zlabel", "zlog", NULL};
    lua_getfield(L, pt, "map");
    if (lua_isnil(L, -1)) {
        lua_pop(L, 1);
        return;
    }
    int mt = lua_gettop(L);
    cpl_check_args(L, mt, "plot.render (map)", known);
    p->mx = array_field(L, mt, "x", &p->nx);
    p->my = array_field(L, mt, "y", &p->ny);
    if (p->nx < 2 || p->ny < 2)
        cpl_error(L, FNAME, "a map needs at least 2 x and 2 y values");
    for (size_t i = 1; i < p->nx; i++)
        if (!(p->mx[i] > p->mx[i - 1]))
            cpl_error(L, FNAME, "map x values must increase");
    for (size_t j = 1; j < p->ny; j++)
        if (!(p->my[j] > p->my[j - 1]))
            cpl_error(L, FNAME, "map y values must increase");
    if (p->xlog)
        check_positive(L, p->mx, p->nx, "map.x");
    if (p->ylog)
        check_positive(L, p->my, p->ny, "map.y");
    p->zlabel = opt_string_field(L, mt, "zlabel");
    p->zlog = opt_bool_field(L, mt, "zlog", 0);
    double *z = lua_newuserdatauv(L, p->nx * p->ny * sizeof *z, 0);
    lua_getfield(L, mt, "z");
    if (!lua_istable(L, -1) || lua_rawlen(L, -1) != p->ny)
        cpl_error(L, FNAME, "map z must be a list of %d rows (one per y value)", (int)p->ny);
    int defined = 0;
    for (size_t j = 0; j < p->ny; j++) {
        lua_rawgeti(L, -1, (lua_Integer)j + 1);
        if (!lua_istable(L, -1) || lua_rawlen(L, -1) != p->nx)
            cpl_error(L, FNAME, "map z[%d] must be a row of %d values", (int)j + 1, (int)p->nx);
        for (size_t i = 0; i < p->nx; i++) {
            lua_rawgeti(L, -1, (lua_Integer)i + 1);
            double v = lua_isnil(L, -1) ? NAN : lua_tonumber(L, -1);
            if (!lua_isnil(L, -1) && !lua_isnumber(L, -1))
                cpl_error(L, FNAME, "map z[%d][%d] is not a number", (int)j + 1, (int)i + 1);
            if (isinf(v) || (p->zlog && v <= 0))
                v = NAN; /* shown as a gap */
            defined |= !isnan(v);
            z[j * p->nx + i] = v;
            lua_pop(L, 1);
        }
        lua_pop(L, 1);
    }
    lua_pop(L, 1);
    if (!defined)
        cpl_error(L, FNAME, "the map has no finite value to show");
    p->mz = z;
    lua_remove(L, mt);
}

static void read_panel(lua_State *L, int pt, panel *p)
{
    static const char *const known[] = {"title", "xlabel", "ylabel", "xlog", "ylog", "ymin",
                                        "ymax", "lines", "bars", "map", "hlines", "categories",
                                        "legend", NULL};
    static const char *const legends[] = {"top right", "top left", "bottom right",
                                          "bottom left", "right", "left", "top", "bottom", NULL};
    static const int legend_flags[] = {
        PL_POSITION_TOP | PL_POSITION_RIGHT, PL_POSITION_TOP | PL_POSITION_LEFT,
        PL_POSITION_BOTTOM | PL_POSITION_RIGHT, PL_POSITION_BOTTOM | PL_POSITION_LEFT,
        PL_POSITION_RIGHT, PL_POSITION_LEFT, PL_POSITION_TOP, PL_POSITION_BOTTOM};
    cpl_check_args(L, pt, "plot.render (a panel)", known);
    p->title = opt_string_field(L, pt, "title");
    p->xlabel = opt_string_field(L, pt, "xlabel");
    p->ylabel = opt_string_field(L, pt, "ylabel");
    p->legend_position = legend_flags[cpl_option(L, pt, FNAME, "legend", legends, "top right")];
    p->xlog = opt_bool_field(L, pt, "xlog", 0);
    p->ylog = opt_bool_field(L, pt, "ylog", 0);
    p->has_ymin = cpl_has(L, pt, "ymin");
    p->has_ymax = cpl_has(L, pt, "ymax");
    p->ymin = cpl_opt_number(L, pt, FNAME, "ymin", "", 0);
    p->ymax = cpl_opt_number(L, pt, FNAME, "ymax", "", 1);
    if (p->ylog && ((p->has_ymin && !(p->ymin > 0)) || (p->has_ymax && !(p->ymax > 0))))
        cpl_error(L, FNAME, "ymin and ymax must be positive on a logarithmic axis");
    if (p->has_ymin && p->has_ymax && !(p->ymax > p->ymin))
        cpl_error(L, FNAME, "ymax %g must be above ymin %g", p->ymax, p->ymin);
    read_curves(L, pt, p);
    p->nlabels = string_list(L, pt, "categories", p->categories, MAX_CATEGORIES);
    read_bars(L, pt, p);
    read_map(L, pt, p);
    int kinds = (p->ncurves > 0 || p->ncat > 0) + (p->mz != NULL);
    if (kinds == 0)
        cpl_error(L, FNAME, "a panel needs lines, bars or a map");
    if (kinds > 1)
        cpl_error(L, FNAME, "a map cannot share its panel with lines or bars");
    if (p->nlabels > 0 && p->xlog)
        cpl_error(L, FNAME, "named categories on x and xlog do not go together");
    lua_getfield(L, pt, "hlines");
    if (!lua_isnil(L, -1)) {
        int ht = lua_gettop(L);
        if (!lua_istable(L, ht) || lua_rawlen(L, ht) > MAX_HLINES)
            cpl_error(L, FNAME, "'hlines' must be a list of at most %d {y = ..., label = ...}", MAX_HLINES);
        p->nhlines = (int)lua_rawlen(L, ht);
        for (int i = 0; i < p->nhlines; i++) {
            lua_rawgeti(L, ht, i + 1);
            static const char *const hk[] = {"y", "label", NULL};
            cpl_check_args(L, -1, "plot.render (an hline)", hk);
            p->hline[i] = cpl_number(L, lua_gettop(L), FNAME, "y", "");
            if (p->ylog && !(p->hline[i] > 0))
                cpl_error(L, FNAME, "hline y must be positive on a logarithmic axis");
            p->hline_label[i] = opt_string_field(L, lua_gettop(L), "label");
            lua_pop(L, 1);
        }
    }
    lua_pop(L, 1);
}

static const char *device_for(const char *path)
{
    const char *dot = strrchr(path, '.');
    if (dot == NULL)
        return NULL;
    if (strcmp(dot, ".png") == 0 || strcmp(dot, ".PNG") == 0)
        return "pngcairo";
    if (strcmp(dot, ".svg") == 0 || strcmp(dot, ".SVG") == 0)
        return "svgcairo";
    if (strcmp(dot, ".pdf") == 0 || strcmp(dot, ".PDF") == 0)
        return "pdfcairo";
    return NULL;
}

static int device_available(const char *device)
{
    enum { MAXDEV = 128 };
    const char *menu_store[MAXDEV], *name_store[MAXDEV];
    const char **menu = menu_store, **names = name_store;
    int n = MAXDEV; /* in: room in the arrays; out: the number of file devices */
    plgFileDevs(&menu, &names, &n);
    for (int i = 0; i < n; i++)
        if (strcmp(names[i], device) == 0)
            return 1;
    return 0;
}

/* ---- drawing (no Lua calls from here on) --------------------------------------------- */

static double axis_value(double v, int logscale)
{
    return logscale ? log10(v) : v;
}

static void widen(double *lo, double *hi)
{
    if (*hi > *lo)
        return;
    double d = fabs(*lo) > 0 ? 0.1 * fabs(*lo) : 1;
    *lo -= d;
    *hi += d;
}

/* Data limits of a panel in axis coordinates (log10 for log axes). */
static void panel_limits(const panel *p, double *x0, double *x1, double *y0, double *y1)
{
    *x0 = *y0 = INFINITY;
    *x1 = *y1 = -INFINITY;
    for (int i = 0; i < p->ncurves; i++) {
        const curve *c = &p->curves[i];
        for (size_t k = 0; k < c->n; k++) {
            *x0 = fmin(*x0, axis_value(c->x[k], p->xlog));
            *x1 = fmax(*x1, axis_value(c->x[k], p->xlog));
            *y0 = fmin(*y0, axis_value(c->y[k], p->ylog));
            *y1 = fmax(*y1, axis_value(c->y[k], p->ylog));
        }
    }
    if (p->nlabels > 0) {
        *x0 = fmin(*x0, 0.4);
        *x1 = fmax(*x1, (double)p->nlabels + 0.6);
    }
    if (p->ncat > 0) {
        for (size_t k = 0; k < p->ncat; k++) {
            *y0 = fmin(*y0, axis_value(p->bars[k], p->ylog));
            *y1 = fmax(*y1, axis_value(p->bars[k], p->ylog));
        }
        if (!p->ylog)
            *y0 = fmin(*y0, 0);
    }
    for (int i = 0; i < p->nhlines; i++) {
        *y0 = fmin(*y0, axis_value(p->hline[i], p->ylog));
        *y1 = fmax(*y1, axis_value(p->hline[i], p->ylog));
    }
    if (p->mz) {
        *x0 = axis_value(p->mx[0], p->xlog);
        *x1 = axis_value(p->mx[p->nx - 1], p->xlog);
        *y0 = axis_value(p->my[0], p->ylog);
        *y1 = axis_value(p->my[p->ny - 1], p->ylog);
    }
    widen(x0, x1);
    if (p->ncurves > 0 && p->nlabels == 0 && !p->mz) {
        double pad = 0.02 * (*x1 - *x0);
        *x0 -= pad;
        *x1 += pad;
    }
    widen(y0, y1);
    if (!p->mz) {
        double pad = (p->ncat > 0 && p->ylog ? 0.15 : 0.06) * (*y1 - *y0);
        *y0 -= p->ncat > 0 && !p->ylog && *y0 == 0 ? 0 : pad;
        *y1 += pad;
    }
    if (p->has_ymin)
        *y0 = axis_value(p->ymin, p->ylog);
    if (p->has_ymax)
        *y1 = axis_value(p->ymax, p->ylog);
    widen(y0, y1);
}

/* PLplot line style of curve i: solid or (dashed) short dashes for the first COLOURS
 * curves, long dashes or long-short dashes once the colours repeat, so that no two curves
 * of a panel look alike. */
static PLINT line_style(const curve *c, int i)
{
    if (i < COLOURS)
        return c->dashed ? 2 : 1;
    return c->dashed ? 5 : 3;
}

static void draw_legend(const panel *p)
{
    PLINT opts[MAX_LINES], colours[MAX_LINES], styles[MAX_LINES], symcol[MAX_LINES];
    PLINT symnum[MAX_LINES];
    PLFLT widths[MAX_LINES], symscale[MAX_LINES];
    const char *text[MAX_LINES], *symbols[MAX_LINES];
    int n = 0;
    for (int i = 0; i < p->ncurves; i++) {
        const curve *c = &p->curves[i];
        if (c->label == NULL)
            continue;
        opts[n] = (c->line ? PL_LEGEND_LINE : 0) | (c->points ? PL_LEGEND_SYMBOL : 0);
        colours[n] = symcol[n] = 2 + i % COLOURS;
        styles[n] = line_style(c, i);
        widths[n] = 2;
        symscale[n] = 1;
        symnum[n] = 1;
        symbols[n] = "#(728)";
        text[n] = c->label;
        n++;
    }
    if (n == 0)
        return;
    PLFLT w, h;
    plschr(0, 0.75);
    pllegend(&w, &h, PL_LEGEND_BACKGROUND | PL_LEGEND_BOUNDING_BOX,
             p->legend_position | PL_POSITION_INSIDE, 0.02, 0.02, 0.06, 0, 1, 1,
             0, 0, n, opts, 1.0, 1.0, 2.0, 0.0, colours, text, NULL, NULL, NULL, NULL, colours,
             styles, widths, symcol, symscale, symnum, symbols);
    plschr(0, 1.0);
}

static void colour_for(double t)
{
    plcol1(fmin(1, fmax(0, t)));
}

/* The axis of a logarithmic colour bar (window log10 z in [lo, hi]) that spans less than
 * a decade, where PLplot would label one decade or none: ticks at round values of z
 * (steps of 1, 2 or 5 times a power of ten, 2 to 6 of them) labelled with their values.
 * Returns the length of the longest label (characters). */
static size_t log_bar_ticks(double lo, double hi)
{
    size_t longest = 0;
    plbox("bc", 0, 0, "bc", 0, 0);
    double zlo = pow(10, lo), zhi = pow(10, hi);
    double step = pow(10, floor(log10((zhi - zlo) / 5)));
    if ((zhi - zlo) / step > 6)
        step *= (zhi - zlo) / (2 * step) > 6 ? 5 : 2;
    for (double z = ceil(zlo / step) * step; z <= zhi * (1 + 1e-12); z += step) {
        double t = log10(z);
        if (!(z > 0) || t < lo || t > hi)
            continue;
        PLFLT tx[2] = {0.7, 1}, ty[2] = {t, t};
        plline(2, tx, ty);
        char label[32]; /* enough digits to tell neighbouring ticks apart */
        int digits = (int)ceil(log10(zhi / step)) + 1;
        snprintf(label, sizeof label, "%.*g", digits < 2 ? 2 : digits > 12 ? 12 : digits, z);
        plmtex("rv", 0.5, (t - lo) / (hi - lo), 0, label);
        if (strlen(label) > longest)
            longest = strlen(label);
    }
    return longest;
}

static void draw_map(const panel *p, double x0, double x1, double y0, double y1)
{
    double zmin = INFINITY, zmax = -INFINITY;
    for (size_t k = 0; k < p->nx * p->ny; k++) {
        double v = p->mz[k];
        if (!isnan(v)) {
            v = p->zlog ? log10(v) : v;
            zmin = fmin(zmin, v);
            zmax = fmax(zmax, v);
        }
    }
    widen(&zmin, &zmax);
    /* each cell spans the midpoints to its neighbours (the grid values are its centres) */
    for (size_t j = 0; j < p->ny; j++) {
        double yc = axis_value(p->my[j], p->ylog);
        double ylo = j > 0 ? 0.5 * (yc + axis_value(p->my[j - 1], p->ylog)) : y0;
        double yhi = j + 1 < p->ny ? 0.5 * (yc + axis_value(p->my[j + 1], p->ylog)) : y1;
        for (size_t i = 0; i < p->nx; i++) {
            double v = p->mz[j * p->nx + i];
            if (isnan(v))
                continue;
            double xc = axis_value(p->mx[i], p->xlog);
            double xlo = i > 0 ? 0.5 * (xc + axis_value(p->mx[i - 1], p->xlog)) : x0;
            double xhi = i + 1 < p->nx ? 0.5 * (xc + axis_value(p->mx[i + 1], p->xlog)) : x1;
            PLFLT bx[4] = {xlo, xhi, xhi, xlo}, by[4] = {ylo, ylo, yhi, yhi};
            colour_for(((p->zlog ? log10(v) : v) - zmin) / (zmax - zmin));
            plfill(4, bx, by);
        }
    }
    /* the colour bar: a strip of the scale to the right of the panel */
    PLFLT vx0, vx1, vy0, vy1;
    plgvpd(&vx0, &vx1, &vy0, &vy1);
    plvpor(vx1 + 0.02, vx1 + 0.05, vy0, vy1);
    plwind(0, 1, zmin, zmax);
    enum { STEPS = 64 };
    for (int s = 0; s < STEPS; s++) {
        double a = zmin + (zmax - zmin) * s / STEPS, b = zmin + (zmax - zmin) * (s + 1) / STEPS;
        PLFLT bx[4] = {0, 1, 1, 0}, by[4] = {a, a, b, b};
        colour_for((s + 0.5) / STEPS);
        plfill(4, bx, by);
    }
    plcol0(1);
    double label_offset = 5.0; /* character heights right of the bar: past the tick labels */
    if (p->zlog && zmax - zmin < 1)
        label_offset = fmax(label_offset, 1.5 + 0.75 * (double)log_bar_ticks(zmin, zmax));
    else
        plbox("bc", 0, 0, p->zlog ? "bcmstvl" : "bcmstv", 0, 0);
    if (p->zlabel)
        plmtex("r", label_offset, 0.5, 0.5, p->zlabel);
    plvpor(vx0, vx1, vy0, vy1);
    plwind(x0, x1, y0, y1);
}

static void draw_panel(const panel *p, int index, int npanels)
{
    double x0, x1, y0, y1;
    panel_limits(p, &x0, &x1, &y0, &y1);
    pladv(index + 1);
    plschr(0, npanels > 2 ? 0.8 : 1.0);
    plvpor(0.12, p->mz ? 0.80 : 0.95, p->nlabels > 0 ? 0.22 : 0.14, 0.90);
    plwind(x0, x1, y0, y1);
    if (p->mz)
        draw_map(p, x0, x1, y0, y1);
    plcol0(1);
    plwidth(1);
    char xopt[16], yopt[16];
    snprintf(xopt, sizeof xopt, "%s%s", p->nlabels > 0 ? "bc" : "bcnst", p->xlog ? "l" : "");
    snprintf(yopt, sizeof yopt, "bcnstv%s", p->ylog ? "l" : "");
    if (!p->mz && p->ncat == 0) {
        plcol0(15);
        pllsty(3);
        plbox("g", 0, 0, "g", 0, 0);
        pllsty(1);
        plcol0(1);
    }
    plbox(xopt, 0, 0, yopt, 0, 0);
    pllab(p->xlabel ? p->xlabel : "", p->ylabel ? p->ylabel : "", p->title ? p->title : "");

    for (size_t k = 0; k < p->ncat; k++) {
        double base = p->ylog ? y0 : 0, top = axis_value(p->bars[k], p->ylog);
        PLFLT bx[4] = {k + 0.65, k + 1.35, k + 1.35, k + 0.65}, by[4] = {base, base, top, top};
        plcol0(2);
        plfill(4, bx, by);
        plcol0(1);
        plline(4, bx, by);
        if (p->bar_notes[0]) {
            plschr(0, 0.7);
            plptex((double)k + 1, top + 0.02 * (y1 - y0), 1, 0, 0.5, p->bar_notes[k]);
            plschr(0, npanels > 2 ? 0.8 : 1.0);
        }
    }
    plcol0(1);
    for (size_t k = 0; k < p->nlabels; k++)
        plmtex("b", 1.2, ((double)k + 1 - x0) / (x1 - x0), 0.5, p->categories[k]);
    for (int i = 0; i < p->ncurves; i++) {
        const curve *c = &p->curves[i];
        PLFLT xs[4096], ys[4096];
        plcol0(2 + i % COLOURS);
        pllsty(line_style(c, i));
        plwidth(2);
        /* in chunks so that no allocation is needed; chunks overlap by one point */
        for (size_t start = 0; start < c->n; start += 4095) {
            size_t m = c->n - start < 4096 ? c->n - start : 4096;
            for (size_t k = 0; k < m; k++) {
                xs[k] = axis_value(c->x[start + k], p->xlog);
                ys[k] = axis_value(c->y[start + k], p->ylog);
            }
            if (c->line && m > 1)
                plline((PLINT)m, xs, ys);
            if (c->points)
                plstring((PLINT)m, xs, ys, "#(728)");
            if (m < 4096)
                break;
        }
        pllsty(1);
        plwidth(1);
    }
    for (int i = 0; i < p->nhlines; i++) {
        double y = axis_value(p->hline[i], p->ylog);
        PLFLT hx[2] = {x0, x1}, hy[2] = {y, y};
        plcol0(1);
        pllsty(2);
        plline(2, hx, hy);
        pllsty(1);
        if (p->hline_label[i]) {
            plschr(0, 0.7);
            plptex(x0 + 0.01 * (x1 - x0), y + 0.015 * (y1 - y0), 1, 0, 0, p->hline_label[i]);
            plschr(0, 1.0);
        }
    }
    draw_legend(p);
}

static void render(const figure *f)
{
    /* cmap0: 0 background, 1 ink, 2.. a colour-blind-safe palette (Okabe & Ito 2008), 15 grid */
    static const int palette[COLOURS][3] = {{0, 114, 178}, {213, 94, 0},  {0, 158, 115},
                                            {204, 121, 167}, {230, 159, 0}, {86, 180, 233},
                                            {0, 0, 0},      {240, 228, 66}, {120, 120, 120},
                                            {150, 60, 20}};
    plsdev(f->device);
    plsfnam(f->out);
    plspage(90, 90, (PLINT)f->width, (PLINT)f->height, 0, 0);
    plscmap0n(16);
    plscol0(0, 255, 255, 255);
    plscol0(1, 0, 0, 0);
    for (int i = 0; i < COLOURS; i++)
        plscol0(2 + i, palette[i][0], palette[i][1], palette[i][2]);
    plscol0(15, 200, 200, 200);
    /* cmap1: dark blue - teal - yellow, a perceptually ordered ramp */
    PLFLT pos[3] = {0, 0.5, 1}, r[3] = {0.15, 0.13, 0.99}, g[3] = {0.05, 0.57, 0.91},
          b[3] = {0.45, 0.55, 0.15};
    plscmap1l(1, 3, pos, r, g, b, NULL);
    plssub(1, f->npanels);
    plinit();
    for (int i = 0; i < f->npanels; i++)
        draw_panel(&f->panels[i], i, f->npanels);
    if (f->title) {
        pladv(1);
        plvpor(0, 1, 0, 1);
        plcol0(1);
        plschr(0, 1.1);
        plmtex("t", -1.5, 0.5, 0.5, f->title);
    }
    plend();
}

static int l_render(lua_State *L)
{
    static const char *const known[] = {"out", "title", "width", "height", "panels", NULL};
    cpl_check_args(L, 1, FNAME, known);
    figure *f = lua_newuserdatauv(L, sizeof *f, 0);
    memset(f, 0, sizeof *f);
    lua_getfield(L, 1, "out");
    f->out = lua_tostring(L, -1);
    if (lua_type(L, -1) != LUA_TSTRING)
        return cpl_error(L, FNAME, "'out' must be a file name ending in .png, .svg or .pdf");
    lua_pop(L, 1);
    f->device = device_for(f->out);
    if (f->device == NULL)
        return cpl_error(L, FNAME, "'out' %s must end in .png, .svg or .pdf", f->out);
    f->title = opt_string_field(L, 1, "title");
    f->width = cpl_opt_integer(L, 1, FNAME, "width", 900, 100, 10000);
    f->height = cpl_opt_integer(L, 1, FNAME, "height", 600, 100, 10000);
    lua_getfield(L, 1, "panels");
    int pt = lua_gettop(L);
    if (!lua_istable(L, pt) || lua_rawlen(L, pt) < 1 || lua_rawlen(L, pt) > MAX_PANELS)
        return cpl_error(L, FNAME, "'panels' must be a list of 1 to %d panels", MAX_PANELS);
    f->npanels = (int)lua_rawlen(L, pt);
    for (int i = 0; i < f->npanels; i++) {
        lua_rawgeti(L, pt, i + 1);
        int one = lua_gettop(L);
        if (!lua_istable(L, one))
            return cpl_error(L, FNAME, "panels[%d] must be a table", i + 1);
        read_panel(L, one, &f->panels[i]);
        lua_remove(L, one); /* keeps the arrays read from it on the stack */
    }
    if (!device_available(f->device))
        return cpl_error(L, FNAME, "PLplot has no %s driver here (install plplot-driver-cairo)",
                         f->device);
    FILE *probe = fopen(f->out, "wb");
    if (probe == NULL)
        return cpl_error(L, FNAME, "cannot write %s: %s", f->out, strerror(errno));
    fclose(probe);

    pthread_mutex_lock(&plot_lock);
    render(f);
    pthread_mutex_unlock(&plot_lock);
    lua_pushvalue(L, 1);
    lua_getfield(L, -1, "out");
    lua_createtable(L, 0, 2);
    lua_insert(L, -2);
    lua_setfield(L, -2, "out");
    cpl_set_string(L, "device", f->device);
    return 1;
}

static const cpl_function plot_functions[] = {
    {"render", l_render,
     "plot.render{out = \"fig.png\" | \".svg\" | \".pdf\", panels = {panel, ...} [, title]\n"
     "            [, width = 900] [, height = 600]}   (pixels; the panels are stacked)\n"
     "A panel: {title, xlabel, ylabel, xlog, ylog, ymin, ymax,\n"
     "  lines = {{x = {...}, y = {...}, label = \"...\", points = false, line = true,\n"
     "            dashed = false}, ...},\n"
     "  bars = {values = {...}, categories = {\"name\", ...}, notes = {\"text\", ...}},\n"
     "  categories = {\"name\", ...} (names for x = 1, 2, ... instead of numbers),\n"
     "  map = {x = {...increasing}, y = {...}, z = {{row for y[1]}, ...}, zlabel, zlog},\n"
     "  hlines = {{y = 0.5, label = \"T/T_F = 0.5\"}, ...},\n"
     "  legend = \"top right\" | \"top left\" | \"bottom right\" | \"bottom left\" | \"right\" | ...}\n"
     "Labels use PLplot's text escapes (#u superscript, #d subscript, #gw omega).\n"
     "Draws with PLplot's Cairo drivers; returns {out, device}.  cp.plot.sweep, .map,\n"
     ".waterfall, .raman and .bands build common figures on it.\n"
     "Example: cp.plot.render{out = \"y.png\", panels = {{xlabel = \"x\", ylabel = \"y\",\n"
     "           lines = {{x = {1, 2, 3}, y = {1, 4, 9}, label = \"x#u2#d\"}}}}}"},
    {NULL, NULL, NULL}};

int luaopen_coldprep_plot(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, plot_functions);
    return 1;
}
