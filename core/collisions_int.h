/*
 * Private to the collision model: the argument checks shared by the hold (collisions_hold.c)
 * and the evaporation trajectory (collisions_evap.c), and the radial solver
 * (collisions_radial.c) behind the rates of protected molecules (collisions_shielded.c).
 * Not installed.
 */
#ifndef COLDPREP_COLLISIONS_INT_H
#define COLDPREP_COLLISIONS_INT_H

#include "coldprep/collisions.h"

/* A thermal cloud: number in [1, 1e12], temperature in (0, 1e-2] K, each omega in (0, 1e7]
 * rad/s, mass in (1e-28, 1e-22] kg.  ctx names the calling function in messages. */
cp_status cp_collisions_check_cloud(const char *ctx, double number, double temperature,
                                    const double omega[3], double mass, cp_error *err);

/* wave is CP_LOSS_S_WAVE or CP_LOSS_P_WAVE. */
cp_status cp_collisions_check_wave(const char *ctx, cp_loss_wave wave, cp_error *err);

/* A logarithmic radial grid r_i = exp(x0 + i h), i = 0 .. n - 1 (n >= 16), and the order
 * nu of the outer Riccati-Hankel functions (L + 1/2 in 3D, |m| in 2D). */
typedef struct cp_radial_grid {
    size_t n;
    double x0, h, nu;
} cp_radial_grid;

/* Loss probability of one channel at wave number k (1/m, > 0): u_pot[i] = 1/4 + r_i^2
 * 2 mu V_i / hbar^2 (3D, V including the centrifugal term) or m^2 + r_i^2 2 mu V_i /
 * hbar^2 (2D), so that w'' = (u_pot - k^2 r^2) w for u = r^{1/2} w in x = ln r (r2[i] =
 * r_i^2, precomputed by the caller); the wave
 * is purely incoming at r_0 and the potential negligible near r_{n-1}.  CP_ENUMERIC when
 * the result is not a probability (grid too coarse). */
cp_status cp_radial_absorption(const cp_radial_grid *g, const double *u_pot, const double *r2,
                               double k, double *prob, cp_error *err);

/* ---- the cache of cp_collisions_shielded_cached (collisions_cache.c) ---- */

/* A table of one channel class: its inner radius r_in and u_pot there, and, for a step h in
 * ln r, u_pot and r^2 on the grid r_i = exp(ln r_in + i h), i < n (cap allocated; u_pot and
 * r2 share one allocation).  Found by key: CP_RADIAL_KEY doubles naming every input the
 * numbers depend on, compared bit for bit. */
#define CP_RADIAL_KEY 32
typedef struct cp_radial_table {
    double key[CP_RADIAL_KEY];
    unsigned long long hash;
    double r_in, u_in, h;
    size_t n, cap;
    double *u_pot, *r2;
} cp_radial_table;

/* The table with this key, or NULL (also when c is NULL). */
cp_radial_table *cp_shielded_cache_find(cp_shielded_cache *c, const double *key);

/* A zeroed table with this key, made room for by dropping the oldest (c not NULL). */
cp_radial_table *cp_shielded_cache_add(cp_shielded_cache *c, const double *key);

/* Room for n grid points in t, the filled ones kept (c NULL: a table outside any cache).
 * 0 when out of memory. */
int cp_radial_table_reserve(cp_shielded_cache *c, cp_radial_table *t, size_t n);

/* The dc shielding field remembered for key = {dipole, rot_const_hz}: 1 and *field, or 0. */
int cp_shielded_cache_field(const cp_shielded_cache *c, const double key[2], double *field);
void cp_shielded_cache_set_field(cp_shielded_cache *c, const double key[2], double field);

#endif
