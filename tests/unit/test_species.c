/*
 * Species data: a sample of entries against their published values, derived facts
 * (statistics from neutron numbers, molecule mass = sum of atoms), name lookup and
 * suggestions, and the error checks.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#include "coldprep/consts.h"
#include "coldprep/species.h"

#include "check_close.h"

/* SPECIES-1: masses from AME2020 (Wang et al., Chinese Phys. C 45, 030003 (2021),
 * file mass_1.mas20). */
static void test_atom_masses_ame2020(void **state)
{
    (void)state;
    static const struct {
        const char *name;
        double mass_u;
    } sample[] = {{"6Li", 6.01512288742}, {"40K", 39.963998165}, {"87Rb", 86.909180529},
                  {"133Cs", 132.905451958}, {"23Na", 22.98976928195}};
    for (size_t i = 0; i < sizeof sample / sizeof sample[0]; i++) {
        const cp_atom *a;
        assert_int_equal(cp_species_atom(sample[i].name, &a, NULL), CP_OK);
        assert_rel(a->mass_u, sample[i].mass_u, 1e-12);
        assert_rel(cp_atom_mass(a), sample[i].mass_u * 1.66053906660e-27, 1e-12);
    }
}

/* SPECIES-2: statistics from the parity of the neutron number (2Z + N fermions): 6Li and
 * 40K, 87Sr, 173Yb are fermions; 7Li, 23Na, 87Rb, 133Cs, 88Sr are bosons. */
static void test_atom_statistics(void **state)
{
    (void)state;
    const char *fermions[] = {"6Li", "40K", "87Sr", "173Yb"};
    const char *bosons[] = {"7Li", "23Na", "39K", "41K", "85Rb", "87Rb", "133Cs", "84Sr",
                            "88Sr", "174Yb"};
    const cp_atom *a;
    for (size_t i = 0; i < 4; i++) {
        assert_int_equal(cp_species_atom(fermions[i], &a, NULL), CP_OK);
        assert_int_equal(cp_atom_statistics(a), CP_FERMION);
    }
    for (size_t i = 0; i < 10; i++) {
        assert_int_equal(cp_species_atom(bosons[i], &a, NULL), CP_OK);
        assert_int_equal(cp_atom_statistics(a), CP_BOSON);
    }
}

/* SPECIES-3: molecules.  Mass of 40K87Rb = 126.873178694 u and the statistics worked out
 * from the neutron numbers by hand (KRb, NaK, LiCs, NaLi fermions; RbCs, NaRb, NaCs, LiK
 * bosons). */
static void test_molecules(void **state)
{
    (void)state;
    const cp_molecule *m;
    assert_int_equal(cp_species_molecule("40K87Rb", &m, NULL), CP_OK);
    assert_rel(cp_molecule_mass(m) / CP_AMU, 126.873178694, 1e-10);
    struct {
        const char *name;
        cp_statistics s;
    } want[] = {{"KRb", CP_FERMION},   {"NaK", CP_FERMION},     {"LiCs", CP_FERMION},
                {"NaLi", CP_FERMION},  {"RbCs", CP_BOSON},      {"NaRb", CP_BOSON},
                {"NaCs", CP_BOSON},    {"LiK", CP_BOSON}};
    for (size_t i = 0; i < sizeof want / sizeof want[0]; i++) {
        assert_int_equal(cp_species_molecule(want[i].name, &m, NULL), CP_OK);
        assert_int_equal(cp_molecule_statistics(m), want[i].s);
    }
    /* every molecule's mass is the sum of its atoms' masses */
    for (size_t i = 0; i < cp_species_molecule_count(); i++) {
        const cp_molecule *mi = cp_species_molecule_at(i);
        const cp_atom *a, *b;
        assert_int_equal(cp_molecule_atoms(mi, &a, &b, NULL), CP_OK);
        assert_rel(cp_molecule_mass(mi), cp_atom_mass(a) + cp_atom_mass(b), 1e-15);
    }
}

/* SPECIES-4: published molecular constants: KRb d = 0.566(17) D (K.-K. Ni et al., Science
 * 322, 231 (2008), arXiv:0808.2963, abstract); RbCs B = 490.173994 MHz (P. D. Gregory et
 * al., Nat. Phys. 17, 1149 (2021), doi:10.1038/s41567-021-01328-7, supplementary constants,
 * as transcribed in a secondary source, not read in the paper); C6 of the estimated
 * entries equals d^4/(6B) + 1e4 a.u. (Julienne, Hanna, Idziaszek, PCCP 13, 19114 (2011)
 * formula) to the 4 digits stored. */
static void test_molecular_constants(void **state)
{
    (void)state;
    const cp_molecule *m;
    assert_int_equal(cp_species_molecule("KRb", &m, NULL), CP_OK);
    assert_rel(m->dipole_debye, 0.566, 1e-12);
    assert_true(m->reactive);
    assert_int_equal(cp_species_molecule("RbCs", &m, NULL), CP_OK);
    assert_rel(m->rot_const_hz, 490.173994e6, 1e-12);
    assert_false(m->reactive);
    const char *estimated[] = {"NaK", "RbCs", "NaRb", "NaCs", "LiK", "LiCs"};
    for (size_t i = 0; i < 6; i++) {
        assert_int_equal(cp_species_molecule(estimated[i], &m, NULL), CP_OK);
        double d = m->dipole_debye * CP_DEBYE / CP_AU_DIPOLE;
        double b = m->rot_const_hz * CP_H / CP_EH;
        assert_rel(m->c6_au, pow(d, 4) / (6 * b) + 1e4, 5e-4);
    }
}

/* SPECIES-5: name forms and the error for an unknown name. */
static void test_lookup_forms_and_errors(void **state)
{
    (void)state;
    const cp_atom *a, *b;
    const cp_molecule *m1, *m2, *m3;
    cp_error err;
    assert_int_equal(cp_species_atom("87Rb", &a, NULL), CP_OK);
    assert_int_equal(cp_species_atom("rb87", &b, NULL), CP_OK);
    assert_ptr_equal(a, b);
    assert_int_equal(cp_species_molecule("40K87Rb", &m1, NULL), CP_OK);
    assert_int_equal(cp_species_molecule("KRb", &m2, NULL), CP_OK);
    assert_int_equal(cp_species_molecule("Rb87K40", &m3, NULL), CP_OK);
    assert_ptr_equal(m1, m2);
    assert_ptr_equal(m1, m3);
    assert_int_equal(cp_species_atom("Rb88", &a, &err), CP_ENOTFOUND);
    assert_null(a);
    assert_non_null(strstr(err.message, "87Rb"));
    assert_int_equal(cp_species_atom("", &a, &err), CP_EINVAL);
    assert_int_equal(cp_species_molecule(NULL, &m1, &err), CP_EINVAL);
}

/* SPECIES-6: each of the first six pairs has a resonance with abg * width > 0 (all
 * physical resonances, Chin et al. RMP 82, 1225 (2010)); out-of-range index is an error. */
static void test_resonances(void **state)
{
    (void)state;
    const char *pairs[] = {"KRb", "NaK", "RbCs", "NaRb", "NaCs", "LiK"};
    for (size_t i = 0; i < 6; i++) {
        const cp_resonance *r;
        int n;
        assert_int_equal(cp_species_resonance_count(pairs[i], &n, NULL), CP_OK);
        assert_true(n >= 1);
        assert_int_equal(cp_species_resonance(pairs[i], 0, &r, NULL), CP_OK);
        assert_true(r->abg * r->width > 0);
        assert_true(r->dmu > 0 && r->b0 > 0);
    }
    const cp_resonance *r;
    cp_error err;
    assert_int_equal(cp_species_resonance("KRb", 0, &r, NULL), CP_OK);
    assert_rel(r->b0, 546.7e-4, 1e-12); /* Zirbel et al., PRA 78, 013416 (2008) [M] */
    assert_int_equal(cp_species_resonance("KRb", 7, &r, &err), CP_ENOTFOUND);
    assert_non_null(strstr(err.message, "out of range"));
}

/* SPECIES-7: the atoms' own scattering lengths.  Every atom has one, |a_bb| <= 1e-6 m, with
 * a source naming the hyperfine (or 1S0) state and a year; spot values against the papers:
 * 174Yb 5.55(8) nm and 173Yb 10.55(11) nm (Kitagawa et al., PRA 77, 012719 (2008),
 * arXiv:0708.0752), 88Sr -1.4(6) a0 (Martinez de Escobar et al., PRA 78, 062708 (2008),
 * arXiv:0808.3434), 7Li |2,2> -27.3(8) a0 (Abraham et al., PRL 74, 1315 (1995)), 23Na
 * |1,-1> 55.4(1.2) a0 (van Abeelen & Verhaar, PRA 59, 578 (1999)); and the sign that
 * matters for a condensate: 87Rb repulsive, 85Rb |2,-2> attractive (Claussen et al., PRA
 * 67, 060701(R) (2003), arXiv:cond-mat/0302195, abstract: -443(3) a0). */
static void test_scattering_lengths(void **state)
{
    (void)state;
    for (size_t i = 0; i < cp_species_atom_count(); i++) {
        const cp_atom *a = cp_species_atom_at(i);
        assert_true(isfinite(a->a_bb) && a->a_bb != 0.0 && fabs(a->a_bb) <= 1e-6);
        assert_non_null(a->a_bb_source);
        assert_true(strstr(a->a_bb_source, "(19") || strstr(a->a_bb_source, "(20"));
        assert_true(strchr(a->a_bb_source, '|') || strstr(a->a_bb_source, "1S0") ||
                    strstr(a->a_bb_source, "triplet"));
    }
    static const struct {
        const char *name;
        double a_bb, tol;
    } published[] = {{"174Yb", 5.55e-9, 1e-12},        {"173Yb", 10.55e-9, 1e-12},
                     {"88Sr", -1.4 * CP_A0, 1e-12},   {"7Li", -27.3 * CP_A0, 1e-12},
                     {"23Na", 55.4 * CP_A0, 1e-12}};
    for (size_t i = 0; i < sizeof published / sizeof published[0]; i++) {
        const cp_atom *a;
        assert_int_equal(cp_species_atom(published[i].name, &a, NULL), CP_OK);
        assert_rel(a->a_bb, published[i].a_bb, published[i].tol);
    }
    const cp_atom *rb87, *rb85;
    assert_int_equal(cp_species_atom("87Rb", &rb87, NULL), CP_OK);
    assert_int_equal(cp_species_atom("85Rb", &rb85, NULL), CP_OK);
    assert_true(rb87->a_bb > 0.0 && rb85->a_bb < 0.0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_atom_masses_ame2020),
        cmocka_unit_test(test_atom_statistics),
        cmocka_unit_test(test_molecules),
        cmocka_unit_test(test_molecular_constants),
        cmocka_unit_test(test_lookup_forms_and_errors),
        cmocka_unit_test(test_resonances),
        cmocka_unit_test(test_scattering_lengths),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
