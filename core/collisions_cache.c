/*
 * The caller-owned cache of cp_collisions_shielded_cached (coldprep/collisions.h): tables
 * of the temperature-independent part of the rate calculation (the inner radius of each
 * channel class and its scaled potential on the radial grid), each found by a key of
 * doubles compared bit for bit, so that a table read from the cache holds the very numbers
 * a fresh calculation would compute.  At most CACHE_TABLES tables and CACHE_BYTES of
 * grids; beyond that the oldest table is dropped (first in, first out).
 */
#include <stdlib.h>
#include <string.h>

#include "collisions_int.h"

#define CACHE_TABLES 256
#define CACHE_BYTES ((size_t)16 << 20)

struct cp_shielded_cache {
    cp_radial_table tables[CACHE_TABLES];
    int count;   /* tables in use, filled in order until CACHE_TABLES */
    int oldest;  /* the next table to drop once all are in use */
    size_t bytes; /* grid memory held */
    /* the dc shielding field of the last rotor asked for (cp_collisions_protected) */
    int have_field;
    double field_key[2], field;
};

cp_shielded_cache *cp_shielded_cache_alloc(void)
{
    return calloc(1, sizeof(cp_shielded_cache));
}

static void drop(cp_shielded_cache *c, cp_radial_table *t)
{
    c->bytes -= 2 * t->cap * sizeof(double);
    free(t->u_pot);
    memset(t, 0, sizeof *t);
}

void cp_shielded_cache_free(cp_shielded_cache *c)
{
    if (!c)
        return;
    for (int i = 0; i < c->count; i++)
        drop(c, &c->tables[i]);
    free(c);
}

/* FNV-1a over the key's bytes: a quick first comparison. */
static unsigned long long key_hash(const double *key)
{
    const unsigned char *b = (const unsigned char *)key;
    unsigned long long h = 14695981039346656037ull;
    for (size_t i = 0; i < CP_RADIAL_KEY * sizeof(double); i++) {
        h ^= b[i];
        h *= 1099511628211ull;
    }
    return h;
}

cp_radial_table *cp_shielded_cache_find(cp_shielded_cache *c, const double *key)
{
    if (!c)
        return NULL;
    unsigned long long h = key_hash(key);
    for (int i = 0; i < c->count; i++) {
        cp_radial_table *t = &c->tables[i];
        if (t->hash == h && memcmp(t->key, key, sizeof t->key) == 0)
            return t;
    }
    return NULL;
}

cp_radial_table *cp_shielded_cache_add(cp_shielded_cache *c, const double *key)
{
    cp_radial_table *t;
    if (c->count < CACHE_TABLES) {
        t = &c->tables[c->count++];
    } else {
        t = &c->tables[c->oldest];
        c->oldest = (c->oldest + 1) % CACHE_TABLES;
        drop(c, t);
    }
    memcpy(t->key, key, sizeof t->key);
    t->hash = key_hash(key);
    return t;
}

int cp_radial_table_reserve(cp_shielded_cache *c, cp_radial_table *t, size_t n)
{
    if (n <= t->cap)
        return 1;
    size_t cap = n + n / 4;
    if (c) {
        /* drop the oldest other tables while the grids would exceed the budget */
        for (int k = 0; k < c->count && c->bytes + 2 * (cap - t->cap) * sizeof(double) >
                                            CACHE_BYTES; k++) {
            cp_radial_table *o = &c->tables[(c->oldest + k) % c->count];
            if (o != t && o->cap > 0) {
                o->n = 0; /* keeps its inner radius; the grid is recomputed when needed */
                c->bytes -= 2 * o->cap * sizeof(double);
                o->cap = 0;
                free(o->u_pot);
                o->u_pot = o->r2 = NULL;
            }
        }
    }
    double *mem = malloc(2 * cap * sizeof *mem);
    if (!mem)
        return 0;
    if (t->n > 0) {
        memcpy(mem, t->u_pot, t->n * sizeof *mem);
        memcpy(mem + cap, t->r2, t->n * sizeof *mem);
    }
    free(t->u_pot);
    if (c)
        c->bytes += 2 * (cap - t->cap) * sizeof(double);
    t->u_pot = mem;
    t->r2 = mem + cap;
    t->cap = cap;
    return 1;
}

int cp_shielded_cache_field(const cp_shielded_cache *c, const double key[2], double *field)
{
    if (!c || !c->have_field || memcmp(c->field_key, key, sizeof c->field_key) != 0)
        return 0;
    *field = c->field;
    return 1;
}

void cp_shielded_cache_set_field(cp_shielded_cache *c, const double key[2], double field)
{
    if (!c)
        return;
    memcpy(c->field_key, key, sizeof c->field_key);
    c->field = field;
    c->have_field = 1;
}
