/*
 * Provenance of the built-in species data: every tabulated value has a source, verified
 * values cite a DOI or arXiv id, the records are physically possible, and spot checks of
 * values against the numbers printed in their papers.  Also the polarizability lookup and
 * its errors.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>

#include <cmocka.h>

#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "coldprep/species.h"
#include "coldprep/species_sources.h"

#include "check_close.h"

/* Every finite value of record/kind has a provenance entry; an entry without a publication
 * must say "[M]"; a verified entry's publication must carry a DOI or an arXiv id. */
static int check_record(const char *record, const char *kind)
{
    int checked = 0;
    for (const char *const *f = cp_species_fields(kind); *f; f++) {
        double v;
        const char *unit;
        assert_int_equal(cp_species_value(record, *f, &v, &unit, NULL), CP_OK);
        const cp_datum *d = cp_species_datum(record, *f);
        if (!isfinite(v)) {
            if (d)
                fail_msg("%s.%s has no value but a provenance entry", record, *f);
            continue;
        }
        if (!d)
            fail_msg("%s.%s = %g %s has no source", record, *f, v, unit);
        const cp_reference *r = cp_species_reference(d->reference);
        if (d->reference && !r)
            fail_msg("%s.%s cites unknown reference %s", record, *f, d->reference);
        if (!r && !(d->note && strstr(d->note, "[M]")))
            fail_msg("%s.%s has neither a publication nor an [M] mark", record, *f);
        if (d->verified && !(r && (r->doi || r->arxiv)))
            fail_msg("%s.%s is verified but its source has no DOI or arXiv id", record, *f);
        if (d->verified && d->status == CP_DATA_ESTIMATED)
            fail_msg("%s.%s: an estimate cannot be verified against a paper", record, *f);
        if (d->uncertainty < 0 || !isfinite(d->uncertainty))
            fail_msg("%s.%s has uncertainty %g", record, *f, d->uncertainty);
        checked++;
    }
    return checked;
}

/* SRC-1: walk every built-in atom, molecule and resonance. */
static void test_every_value_has_a_source(void **state)
{
    (void)state;
    int checked = 0;
    for (size_t i = 0; i < cp_species_atom_count(); i++)
        checked += check_record(cp_species_atom_at(i)->name, "atom");
    for (size_t i = 0; i < cp_species_molecule_count(); i++) {
        const cp_molecule *m = cp_species_molecule_at(i);
        checked += check_record(m->name, "molecule");
        int n;
        assert_int_equal(cp_species_resonance_count(m->name, &n, NULL), CP_OK);
        for (int k = 1; k <= n; k++) {
            char rec[64];
            snprintf(rec, sizeof rec, "%s#%d", m->name, k);
            checked += check_record(rec, "resonance");
        }
    }
    /* and no entry points at a field that does not exist or holds no value */
    for (size_t i = 0; i < cp_species_datum_count(); i++) {
        const cp_datum *d = cp_species_datum_at(i);
        double v;
        const char *unit;
        if (cp_species_value(d->record, d->field, &v, &unit, NULL) != CP_OK || !isfinite(v))
            fail_msg("provenance entry %s.%s has no value", d->record, d->field);
    }
    assert_int_equal((size_t)checked, cp_species_datum_count());
    /* every publication has its bibliographic fields */
    for (size_t i = 0; i < cp_species_reference_count(); i++) {
        const cp_reference *r = cp_species_reference_at(i);
        assert_true(r->authors && r->journal && r->volume && r->page);
        assert_true(r->year >= 1900 && r->year <= 2100);
        assert_true(r->doi || r->arxiv);
    }
}

/* SRC-2: physically impossible combinations.  a_bg * Delta > 0 for every resonance
 * (Chin et al., Rev. Mod. Phys. 82, 1225 (2010)); a nuclear spin is half-integer exactly
 * when the mass number is odd, and the atom's statistics follow the neutron number; a
 * molecule is a fermion exactly when it holds an odd number of neutrons. */
static void test_physical_consistency(void **state)
{
    (void)state;
    for (size_t i = 0; i < cp_species_atom_count(); i++) {
        const cp_atom *a = cp_species_atom_at(i);
        int twice_i = (int)lround(2.0 * a->nuclear_spin);
        assert_true(fabs(2.0 * a->nuclear_spin - twice_i) < 1e-12);
        if ((twice_i % 2 == 1) != (a->mass_number % 2 == 1))
            fail_msg("%s: spin %g does not match mass number %d", a->name, a->nuclear_spin,
                     a->mass_number);
        int neutrons = a->mass_number - a->protons;
        assert_int_equal(cp_atom_statistics(a), neutrons % 2 ? CP_FERMION : CP_BOSON);
        if (isfinite(a->pol_1064_au))
            assert_true(a->pol_1064_au > 0);
    }
    for (size_t i = 0; i < cp_species_molecule_count(); i++) {
        const cp_molecule *m = cp_species_molecule_at(i);
        const cp_atom *a, *b;
        assert_int_equal(cp_molecule_atoms(m, &a, &b, NULL), CP_OK);
        int neutrons = a->mass_number - a->protons + b->mass_number - b->protons;
        assert_int_equal(cp_molecule_statistics(m), neutrons % 2 ? CP_FERMION : CP_BOSON);
        assert_true(m->dipole_debye > 0 && m->rot_const_hz > 0 && m->c6_au > 0);
        if (isfinite(m->loss_rate))
            assert_true(m->loss_rate > 0 && m->loss_temperature > 0);
        int n;
        assert_int_equal(cp_species_resonance_count(m->name, &n, NULL), CP_OK);
        for (int k = 0; k < n; k++) {
            const cp_resonance *r;
            assert_int_equal(cp_species_resonance(m->name, k, &r, NULL), CP_OK);
            if (!(r->abg * r->width > 0))
                fail_msg("%s resonance %d: a_bg * Delta = %g m T is not positive", m->name,
                         k + 1, r->abg * r->width);
            assert_true(r->b0 > 0 && r->dmu > 0);
            assert_non_null(strstr(r->states, "+"));
        }
    }
}

/* SRC-3: spot checks against the numbers printed in the papers. */
static void test_spot_checks(void **state)
{
    (void)state;
    const cp_molecule *m;
    /* K.-K. Ni et al., Science 322, 231 (2008), arXiv:0808.2963, abstract: 0.566(17) D */
    assert_int_equal(cp_species_molecule("KRb", &m, NULL), CP_OK);
    assert_rel(m->dipole_debye, 0.566, 1e-12);
    assert_rel(cp_species_datum("40K87Rb", "dipole_debye")->uncertainty, 0.017, 1e-12);
    /* P. K. Molony et al., PRL 113, 255301 (2014), arXiv:1409.1485, abstract: 1.225(3)(8) D */
    assert_int_equal(cp_species_molecule("RbCs", &m, NULL), CP_OK);
    assert_rel(m->dipole_debye, 1.225, 1e-12);
    /* same paper: N=0 -> N=2 splitting h x 2940.09(6) MHz = 6B for a rigid rotor; the
     * tabulated B (Gregory et al. 2016) agrees to 0.05 % (hyperfine shifts of the levels) */
    assert_rel(6.0 * m->rot_const_hz, 2940.09e6, 5e-4);
    /* J. W. Park, S. A. Will, M. W. Zwierlein, NJP 17, 075016 (2015), abstract: 2.72 D */
    assert_int_equal(cp_species_molecule("NaK", &m, NULL), CP_OK);
    assert_rel(m->dipole_debye, 2.72, 1e-12);
    /* 1064 nm polarizabilities from measured static values: W. F. Holmgren et al., PRA 81,
     * 053607 (2010), arXiv:1001.3888, abstract: Na 24.11, K 43.06, Rb 47.24 (1e-24 cm^3);
     * J. M. Amini, H. Gould, PRL 91, 153001 (2003), abstract: Cs 401.0 a0^3.  Recomputed
     * here from the D-line wavelengths (vacuum, nm [M]) and a0^3 = 1.481847e-25 cm^3
     * (CODATA 2018 a0). */
    static const struct {
        const char *atom;
        double alpha0_au, d1_nm, d2_nm;
    } st[] = {{"23Na", 24.11e-24 / 1.481847e-25, 589.7558, 589.1583},
              {"40K", 43.06e-24 / 1.481847e-25, 770.108, 766.701},
              {"87Rb", 47.24e-24 / 1.481847e-25, 794.979, 780.241},
              {"133Cs", 401.0, 894.593, 852.347}};
    for (size_t i = 0; i < sizeof st / sizeof st[0]; i++) {
        const cp_atom *a;
        assert_int_equal(cp_species_atom(st[i].atom, &a, NULL), CP_OK);
        double centroid = 3.0 / (1.0 / st[i].d1_nm + 2.0 / st[i].d2_nm);
        double x = centroid / 1064.0;
        assert_rel(a->pol_1064_au, st[i].alpha0_au / (1.0 - x * x), 5e-4);
    }
    /* Rb: the estimate lies within 3 % of the ab initio 687 a.u. at 1064 nm (Safronova,
     * Arora, Clark, PRA 73, 022505 (2006) [M]) */
    const cp_atom *rb;
    assert_int_equal(cp_species_atom("87Rb", &rb, NULL), CP_OK);
    assert_rel(rb->pol_1064_au, 687.0, 0.03);
    const cp_resonance *r;
    /* Z. Guo et al., arXiv:2108.01856 (2021), abstract: the 23Na-87Rb resonance "near
     * 347.64 G" in the absolute ground states */
    assert_int_equal(cp_species_resonance("NaRb", 0, &r, NULL), CP_OK);
    assert_rel(r->b0, 347.64e-4, 1e-12);
    assert_non_null(strstr(r->states, "23Na |1,1>"));
    assert_non_null(strstr(r->states, "87Rb |1,1>"));
    /* S.-K. Tung et al., PRA 87, 010702(R) (2013), arXiv:1211.2888, abstract: two 6Li-133Cs
     * resonances "as wide as 6 mT (60 G)" */
    assert_int_equal(cp_species_resonance("LiCs", 0, &r, NULL), CP_OK);
    assert_rel(fabs(r->width), 60e-4, 0.05);
    /* M.-S. Heo et al., PRA 86, 021602(R) (2012), arXiv:1205.5304, abstract: NaLi molecules
     * formed on "a narrow Feshbach resonance at 745 G" */
    assert_int_equal(cp_species_resonance("NaLi", 0, &r, NULL), CP_OK);
    assert_rel(r->b0, 745e-4, 1e-12);
    assert_true(fabs(r->width) < 1e-4); /* "narrow": well under 1 G */
    /* S. G. H. Brookes, J. M. Hutson, J. Phys. Chem. A (2022), doi:10.1021/acs.jpca.2c01810,
     * arXiv:2203.10362, abstract: the Na-Cs C6 "must be increased by about 0.9% to
     * 3256(1) Eh a0^6" */
    assert_int_equal(cp_species_resonance("NaCs", 0, &r, NULL), CP_OK);
    assert_rel(r->c6_au, 3256.0, 1e-12);
    assert_rel(cp_species_datum("23Na133Cs#1", "c6_au")->uncertainty, 1.0, 1e-12);
    /* Claussen et al., arXiv:cond-mat/0302195 (2003), abstract: 85Rb |2,-2> background
     * scattering length -443(3) a0 near the 155 G resonance */
    const cp_atom *rb85;
    assert_int_equal(cp_species_atom("85Rb", &rb85, NULL), CP_OK);
    assert_rel(rb85->a_bb, -443.0 * CP_A0, 1e-12);
    assert_non_null(strstr(rb85->a_bb_source, "|2,-2>"));
    /* Chemical reactivity as the experiments' abstracts state it: KRb reacts (S. Ospelkaus
     * et al., Science 327, 853 (2010), arXiv:0912.3854: "exothermic atom-exchange chemical
     * reactions"); NaK is "chemically stable under binary collisions" (J. W. Park, S. A.
     * Will, M. W. Zwierlein, NJP 17, 075016 (2015)); RbCs is "nonreactive" (P. D. Gregory et
     * al., Nat. Commun. 10, 3104 (2019), arXiv:1904.00654) */
    assert_int_equal(cp_species_molecule("KRb", &m, NULL), CP_OK);
    assert_true(m->reactive);
    assert_int_equal(cp_species_molecule("NaK", &m, NULL), CP_OK);
    assert_false(m->reactive);
    assert_int_equal(cp_species_molecule("RbCs", &m, NULL), CP_OK);
    assert_false(m->reactive);
    const char *checked_flags[] = {"40K87Rb", "23Na40K", "87Rb133Cs"};
    for (size_t i = 0; i < 3; i++)
        assert_true(cp_species_datum(checked_flags[i], "reactive")->verified);
}

/* SRC-5: values read only in secondary sources (data modules or papers quoting the
 * original): each is checked against the number as transcribed, with the original paper
 * named; none of them is marked verified. */
static void test_secondary_transcriptions(void **state)
{
    (void)state;
    const cp_molecule *m;
    /* B. Neyenhuis et al., PRL 109, 230403 (2012), arXiv:1209.2226: KRb at 1064 nm,
     * alpha_par = 10.0e-5, alpha_perp = 3.3e-5 MHz/(W/cm^2) as light shifts per intensity
     * (U = -alpha I).  Converted to a.u. two ways: the closed form alpha[a.u.] =
     * alpha[Hz/(W/m^2)] h c / (2 pi a0^3), and the lattice module's own unit conversion. */
    assert_int_equal(cp_species_molecule("KRb", &m, NULL), CP_OK);
    const double par_hz = 10.0e-5 * 1e6 / 1e4, perp_hz = 3.3e-5 * 1e6 / 1e4; /* Hz/(W/m^2) */
    const double per_au = CP_H * CP_C / (2.0 * CP_PI * CP_A0 * CP_A0 * CP_A0);
    assert_rel(m->pol_1064_par_au, par_hz * per_au, 5e-6);
    assert_rel(m->pol_1064_perp_au, perp_hz * per_au, 5e-6);
    double si;
    assert_int_equal(cp_lattice_polarizability_si(10.0e-5 * 1e6, CP_POLARIZABILITY_HZ_PER_W_CM2,
                                                  &si, NULL),
                     CP_OK);
    assert_rel(m->pol_1064_par_au * CP_AU_POLARIZABILITY, si, 5e-6);
    assert_int_equal(cp_lattice_polarizability_si(3.3e-5 * 1e6, CP_POLARIZABILITY_HZ_PER_W_CM2,
                                                  &si, NULL),
                     CP_OK);
    assert_rel(m->pol_1064_perp_au * CP_AU_POLARIZABILITY, si, 5e-6);
    /* the isotropic part, the polarizability of N = 0, is (alpha_par + 2 alpha_perp) / 3 */
    assert_rel(m->pol_1064_au, (m->pol_1064_par_au + 2.0 * m->pol_1064_perp_au) / 3.0, 5e-6);
    /* same secondary source, citing S. Ospelkaus et al., PRL 104, 030402 (2010): B = 1113.950
     * MHz */
    assert_rel(m->rot_const_hz, 1113.950e6, 1e-12);
    /* A second transcription of Neyenhuis et al. gives the same KRb pair as alpha^(0) =
     * 5.53e-5 and alpha^(2) = 4.47e-5 MHz/(W/cm^2): with alpha^(0) = (alpha_par + 2
     * alpha_perp)/3 and alpha^(2) = 2 (alpha_par - alpha_perp)/3 the stored components give
     * both to the digits printed, which fixes that normalisation of alpha^(2) */
    const double au_to_mhz_per_w_cm2 = CP_AU_POLARIZABILITY / (2.0 * CP_EPS0 * CP_C * CP_H) *
                                       1e4 / 1e6; /* U/(h I) = alpha / (2 eps0 c h) */
    assert_rel(m->pol_1064_au * au_to_mhz_per_w_cm2, 5.53e-5, 1e-3);
    assert_rel(2.0 * (m->pol_1064_par_au - m->pol_1064_perp_au) / 3.0 * au_to_mhz_per_w_cm2,
               4.47e-5, 1e-3);
    /* J. A. Blackmore et al., PRA 102, 053316 (2020), arXiv:2007.01762: RbCs alpha^(0) =
     * 2020 a.u. and alpha^(2) = 1997 a.u. at 1064 nm, in the same code's normalisation */
    assert_int_equal(cp_species_molecule("RbCs", &m, NULL), CP_OK);
    assert_rel(m->pol_1064_au, 2020.0, 1e-12);
    assert_rel((m->pol_1064_par_au + 2.0 * m->pol_1064_perp_au) / 3.0, 2020.0, 1e-12);
    assert_rel(2.0 * (m->pol_1064_par_au - m->pol_1064_perp_au) / 3.0, 1997.0, 1e-12);
    /* S. A. Will et al., PRL 116, 225306 (2016): NaK B = 2.8217297 GHz */
    assert_int_equal(cp_species_molecule("NaK", &m, NULL), CP_OK);
    assert_rel(m->rot_const_hz, 2.8217297e9, 1e-12);
    /* M. Guo et al., PRA 97, 020501(R) (2018), arXiv:1801.00108: NaRb B = 2.0896628 GHz */
    assert_int_equal(cp_species_molecule("NaRb", &m, NULL), CP_OK);
    assert_rel(m->rot_const_hz, 2.0896628e9, 1e-12);
    /* J. Aldegunde, J. M. Hutson, PRA 96, 042506 (2017): NaCs B = 1.7396 GHz (calculated);
     * K. Feng et al., arXiv:2607.25774, Table 1 (read in its text) give B_e = 1.74 GHz from
     * the spectroscopic potential: B0 = B_e - alpha_e/2 lies below B_e by ~4-6 MHz (their
     * alpha_e = 7-12 MHz), so the two agree to 0.1 % */
    assert_int_equal(cp_species_molecule("NaCs", &m, NULL), CP_OK);
    assert_rel(m->rot_const_hz, 1.7396e9, 1e-12);
    assert_rel(m->rot_const_hz, 1.74e9, 1e-3);
    /* H. Ladjimi, M. Tomza, PRA 109, 052814 (2024), as quoted in Feng et al.'s Table 1: NaLi
     * d_e = 0.47 D (calculated) */
    assert_int_equal(cp_species_molecule("NaLi", &m, NULL), CP_OK);
    assert_rel(m->dipole_debye, 0.47, 1e-12);
    /* none of these secondary values is marked as checked against its paper */
    static const struct {
        const char *record, *field;
    } secondary[] = {{"40K87Rb", "pol_1064_au"},     {"40K87Rb", "pol_1064_par_au"},
                     {"40K87Rb", "pol_1064_perp_au"}, {"40K87Rb", "rot_const_hz"},
                     {"87Rb133Cs", "pol_1064_au"},   {"87Rb133Cs", "pol_1064_par_au"},
                     {"87Rb133Cs", "pol_1064_perp_au"}, {"87Rb133Cs", "rot_const_hz"},
                     {"23Na40K", "rot_const_hz"},    {"23Na87Rb", "rot_const_hz"},
                     {"23Na133Cs", "rot_const_hz"},  {"23Na6Li", "dipole_debye"}};
    for (size_t i = 0; i < sizeof secondary / sizeof secondary[0]; i++) {
        const cp_datum *d = cp_species_datum(secondary[i].record, secondary[i].field);
        assert_non_null(d);
        assert_false(d->verified);
        assert_non_null(strstr(d->note, "secondary source"));
    }
}

/* SRC-4: polarizability lookup at the tabulated wavelengths; plain errors elsewhere. */
static void test_polarizability_lookup(void **state)
{
    (void)state;
    double alpha;
    cp_error err;
    assert_int_equal(cp_species_polarizability("Rb87", 1064e-9, &alpha, NULL), CP_OK);
    const cp_atom *rb;
    assert_int_equal(cp_species_atom("87Rb", &rb, NULL), CP_OK);
    assert_true(alpha == rb->pol_1064_au);
    assert_int_equal(cp_species_polarizability("87Rb", 1064.5e-9, &alpha, NULL), CP_OK);
    assert_int_equal(cp_species_polarizability("87Rb", 1066e-9, &alpha, &err), CP_ENOTFOUND);
    assert_true(isnan(alpha));
    assert_non_null(strstr(err.message, "polarizability_au"));
    assert_non_null(strstr(err.message, "87Rb"));
    assert_int_equal(cp_species_polarizability("88Sr", 1064e-9, &alpha, &err), CP_ENOTFOUND);
    assert_non_null(strstr(err.message, "no published polarizability of 88Sr"));
    assert_int_equal(cp_species_polarizability("NaK", 1064e-9, &alpha, &err), CP_ENOTFOUND);
    assert_non_null(strstr(err.message, "23Na40K"));
    assert_int_equal(cp_species_polarizability("KRb", 1550e-9, &alpha, &err), CP_ENOTFOUND);
    assert_non_null(strstr(err.message, "40K87Rb"));
    /* a molecule's lookup returns its isotropic part, the polarizability of N = 0 */
    const cp_molecule *krb;
    assert_int_equal(cp_species_molecule("KRb", &krb, NULL), CP_OK);
    assert_int_equal(cp_species_polarizability("KRb", 1064e-9, &alpha, NULL), CP_OK);
    assert_true(alpha == krb->pol_1064_au);
    assert_int_equal(cp_species_polarizability("Xx", 1064e-9, &alpha, &err), CP_ENOTFOUND);
    const double bad[] = {NAN, INFINITY, -INFINITY, 0.0, -1064e-9, 1.0};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        assert_int_equal(cp_species_polarizability("87Rb", bad[i], &alpha, &err), CP_EINVAL);
        assert_non_null(strstr(err.message, "wavelength"));
        assert_true(isnan(alpha));
    }
    double v;
    const char *unit;
    assert_int_equal(cp_species_value("87Rb", "colour", &v, &unit, &err), CP_ENOTFOUND);
    assert_int_equal(cp_species_value("40K87Rb#9", "b0", &v, &unit, &err), CP_ENOTFOUND);
    assert_int_equal(cp_species_value("#1", "b0", &v, &unit, &err), CP_ENOTFOUND);
    assert_null(cp_species_datum("87Rb", "colour"));
    assert_null(cp_species_reference("nobody"));
    assert_null(cp_species_fields("photon"));
    assert_null(cp_species_datum_at(cp_species_datum_count()));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_every_value_has_a_source),
        cmocka_unit_test(test_physical_consistency),
        cmocka_unit_test(test_spot_checks),
        cmocka_unit_test(test_polarizability_lookup),
        cmocka_unit_test(test_secondary_transcriptions),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
