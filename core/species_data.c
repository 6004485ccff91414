/*
 * The built-in species tables: atoms, ground-state bialkali molecules and the interspecies
 * Feshbach resonances used to associate them.  The publication, status, uncertainty and
 * check of every number are in species_provenance.c (one entry per value, walked by
 * tests/unit/test_species_sources.c); the `source` strings here are one-line summaries.
 * NaN marks a value the project has no published number for: lookups that need it ask the
 * user for it.
 *
 * Estimated molecule-molecule C6 in J = 0: C6 = C6_el + d^4/(6B) in atomic units (the
 * rotational part: Julienne, Hanna, Idziaszek, PCCP 13, 19114 (2011)).  C6_el = 1e4 a.u. is
 * the project's own round number for the electronic (dispersion) part, not a published
 * value: the rotational part is 5e5 to 7e6 a.u. for every molecule estimated so except
 * RbCs (1.2e5), so even a C6_el wrong by a factor two moves C6 by under 10 %.
 */
#include <math.h>

#include "species_int.h"

#include "coldprep/consts.h"

/* The atoms' 1064 nm polarizabilities are single-oscillator estimates alpha0 / (1 -
 * (lambda_D / 1064 nm)^2), alpha0 the measured static polarizability, lambda_D the D-line
 * centroid (species_provenance.c).  Each atom's last two fields: a_bb, its own s-wave scattering length (m), and a_bb_source,
 * the hyperfine state it is for, its uncertainty and the paper; "[M]" where the number is
 * recalled rather than read from the source. */
const cp_atom cp_atom_table[] = {
    {"6Li", "Li", 3, 6, 6.01512288742, 1.0, NAN, NAN, "AME2020 mass; I: Stone 2005",
     -2160.0 * CP_A0,
     "triplet a_T, the high-field limit of the |1> + |2> mixture: Abraham et al., PRA 55, "
     "R3299 (1997) [M]"},
    {"7Li", "Li", 3, 7, 7.01600343426, 1.5, NAN, NAN, "AME2020 mass; I: Stone 2005",
     -27.3 * CP_A0,
     "|2,2> (pure triplet), -27.3(8) a0: Abraham et al., PRL 74, 1315 (1995), "
     "doi:10.1103/PhysRevLett.74.1315"},
    {"23Na", "Na", 11, 23, 22.98976928195, 1.5, 234.7, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Holmgren et al. 2010",
     55.4 * CP_A0,
     "|1,-1> at B = 0 (= |1,1> at B = 0), 55.4(1.2) a0: van Abeelen & Verhaar, PRA 59, 578 "
     "(1999), doi:10.1103/PhysRevA.59.578"},
    {"39K", "K", 19, 39, 38.96370648482, 1.5, 606.4, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Holmgren et al. 2010",
     -33.48 * CP_A0,
     "|2,2> (triplet a_T); |1,1> is near -30 a0 at low field and tuned by resonances near 33 G"
     " and 403 G: Falke et al., PRA 78, 012503 (2008), arXiv:0804.2949 [M]"},
    {"40K", "K", 19, 40, 39.963998165, 4.0, 606.4, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Holmgren et al. 2010",
     169.67 * CP_A0,
     "triplet a_T (|9/2,-9/2> + |9/2,-7/2> background): Falke et al., PRA 78, 012503 (2008), "
     "arXiv:0804.2949 [M]"},
    {"41K", "K", 19, 41, 40.96182525611, 1.5, 606.4, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Holmgren et al. 2010",
     60.54 * CP_A0,
     "|2,2> (triplet a_T): Falke et al., PRA 78, 012503 (2008), arXiv:0804.2949 [M]"},
    {"85Rb", "Rb", 37, 85, 84.91178973604, 2.5, 699.8, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Holmgren et al. 2010",
     -443.0 * CP_A0,
     "|2,-2>, background of the 155.041(18) G resonance (width 10.71(2) G), -443(3) a0: "
     "Claussen et al., arXiv:cond-mat/0302195 (2003), abstract; PRA 67, 060701(R) not "
     "re-read"},
    {"87Rb", "Rb", 37, 87, 86.909180529, 1.5, 699.8, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Holmgren et al. 2010",
     100.40 * CP_A0,
     "|1,-1> (= |1,1> at B = 0); the triplet |2,2> value is 98.98 a0: van Kempen et al., PRL "
     "88, 093201 (2002) [M]; a data module transcribes the same 100.4 a0 for |1,-1> from PRA "
     "87, 053614 (2013) (secondary, not read in that paper)"},
    {"133Cs", "Cs", 55, 133, 132.905451958, 3.5, 1187.9, NAN,
     "AME2020 mass; I: Stone 2005; alpha(1064 nm) estimated from Amini & Gould 2003",
     2440.0 * CP_A0,
     "|4,4> (triplet a_T); |3,3> depends strongly on B (zero near 17 G, a few hundred a0 at "
     "20-50 G): give the value at the plan's field.  Chin et al., PRA 70, 032701 (2004) [M]"},
    {"84Sr", "Sr", 38, 84, 83.913419118, 0.0, NAN, NAN, "AME2020 mass; I: Stone 2005",
     122.7 * CP_A0,
     "1S0 (no hyperfine structure): Stein, Knoeckel & Tiemann, Eur. Phys. J. D 57, 171 (2010),"
     " arXiv:1001.2741 [M]"},
    {"87Sr", "Sr", 38, 87, 86.90887749454, 4.5, NAN, NAN, "AME2020 mass; I: Stone 2005",
     96.2 * CP_A0,
     "1S0, between two nuclear-spin states: Stein, Knoeckel & Tiemann, Eur. Phys. J. D 57, 171"
     " (2010), arXiv:1001.2741 [M]"},
    {"88Sr", "Sr", 38, 88, 87.905612253, 0.0, NAN, NAN, "AME2020 mass; I: Stone 2005",
     -1.4 * CP_A0,
     "1S0, -1.4(6) a0: Martinez de Escobar et al., PRA 78, 062708 (2008), arXiv:0808.3434"},
    {"173Yb", "Yb", 70, 173, 172.938216211, 2.5, NAN, NAN, "AME2020 mass; I: Stone 2005",
     10.55e-9,
     "1S0, between two nuclear-spin states, 10.55(11) nm: Kitagawa et al., PRA 77, 012719 "
     "(2008), arXiv:0708.0752"},
    {"174Yb", "Yb", 70, 174, 173.938867545, 0.0, NAN, NAN, "AME2020 mass; I: Stone 2005",
     5.55e-9,
     "1S0, 5.55(8) nm: Kitagawa et al., PRA 77, 012719 (2008), arXiv:0708.0752"},
};
const size_t cp_atom_table_size = sizeof cp_atom_table / sizeof cp_atom_table[0];

/* name, atoms, d (D), B (Hz), C6 (a.u.), reactive, alpha 1064 iso/par/perp (a.u.),
 * alpha 1550 (a.u.), two-body loss rate (m^3/s) and its temperature (K), summary */
const cp_molecule cp_molecule_table[] = {
    {"40K87Rb", "40K", "87Rb", 0.566, 1113.950e6, 16130.0, 1, 1180.539, 2133.504, 704.056, NAN,
     3.0e-18, 250e-9,
     "d: Ni et al., Science 322, 231 (2008); B: Ospelkaus et al. 2010; C6: Kotochigova 2010; "
     "loss: Ospelkaus et al., Science 327, 853 (2010); reactive: Ospelkaus et al. 2010; "
     "alpha(1064 nm): Neyenhuis et al., PRL 109, 230403 (2012)"},
    {"23Na40K", "23Na", "40K", 2.72, 2.8217297e9, 5.197e5, 0, NAN, NAN, NAN, NAN, NAN, NAN,
     "d: as quoted by Park, Will, Zwierlein, NJP 17, 075016 (2015); B: Will et al. 2016; "
     "C6 estimated; non-reactive: Park, Will, Zwierlein 2015"},
    {"87Rb133Cs", "87Rb", "133Cs", 1.225, 490.173994e6, 1.307e5, 0, 2020.0, 4017.0, 1021.5, NAN,
     NAN, NAN,
     "d: Molony et al., PRL 113, 255301 (2014); B: Gregory et al., Nat. Phys. 17, 1149 (2021); "
     "C6 estimated; non-reactive: Gregory et al., Nat. Commun. 10, 3104 (2019); alpha(1064 nm): "
     "Blackmore et al., PRA 102, 053316 (2020)"},
    {"23Na87Rb", "23Na", "87Rb", 3.2, 2.0896628e9, 1.328e6, 0, NAN, NAN, NAN, NAN, NAN, NAN,
     "d: Guo et al., PRL 116, 205303 (2016); B: Guo et al. 2018; C6 estimated; "
     "non-reactive: Zuchowski & Hutson 2010"},
    {"23Na133Cs", "23Na", "133Cs", 4.6, 1.7396e9, 6.772e6, 0, NAN, NAN, NAN, NAN, NAN, NAN,
     "d: calculated, Aymar & Dulieu 2005; B: calculated, Aldegunde & Hutson 2017; C6 estimated; "
     "non-reactive: Zuchowski & Hutson 2010"},
    {"6Li40K", "6Li", "40K", 3.6, 8.78e9, 5.126e5, 1, NAN, NAN, NAN, NAN, NAN, NAN,
     "d: calculated, Aymar & Dulieu 2005; B recalled [M]; C6 estimated; "
     "reactive: Zuchowski & Hutson 2010"},
    {"6Li133Cs", "6Li", "133Cs", 5.5, 6.53e9, 3.692e6, 1, NAN, NAN, NAN, NAN, NAN, NAN,
     "d: Deiglmayr et al., PRA 82, 032503 (2010); B recalled [M]; C6 estimated; "
     "reactive: Zuchowski & Hutson 2010"},
    {"23Na6Li", "23Na", "6Li", 0.47, 12.7e9, 3.7e3, 1, NAN, NAN, NAN, NAN, NAN, NAN,
     "d: calculated, Ladjimi & Tomza 2024 (as quoted by Feng et al. 2026); B and C6 recalled "
     "[M]; reactive: Zuchowski & Hutson 2010"},
};
const size_t cp_molecule_table_size = sizeof cp_molecule_table / sizeof cp_molecule_table[0];

#define GAUSS 1e-4

/* The four resonance parameters of each entry are attributed to one paper (for NaRb the
 * position to a later one); only the NaRb and NaLi positions have been checked against
 * their papers' text, so every record has verified = 0 (details per value in
 * species_provenance.c).  c6_au is the atom-atom C6 of the entrance pair (Derevianko, Babb,
 * Dalgarno 2001; Na-Cs the fitted value of Brookes & Hutson 2022); it sets the mean
 * scattering length abar.  The entrance-channel states are those the attributed paper is
 * recalled to use; they were not read in the papers ([M], species_provenance.c). */
const cp_resonance cp_resonance_table[] = {
    {"40K87Rb", "40K |9/2,-9/2> + 87Rb |1,1>", 546.7 * GAUSS, -3.04 * GAUSS, -187.0 * CP_A0,
     2.3 * CP_MUB, 4274.0, 0, "Zirbel et al., PRA 78, 013416 (2008); C6: Derevianko et al. 2001"},
    {"23Na40K", "23Na |1,1> + 40K |9/2,-5/2>", 138.7 * GAUSS, -1.0 * GAUSS, -700.0 * CP_A0,
     2.0 * CP_MUB, 2447.0, 0,
     "Park et al., PRA 85, 051602(R) (2012), low confidence; C6: Derevianko et al. 2001"},
    {"87Rb133Cs", "87Rb |1,1> + 133Cs |3,3>", 197.1 * GAUSS, 0.6 * GAUSS, 650.0 * CP_A0,
     2.0 * CP_MUB, 5284.0, 0,
     "Takekoshi et al., PRA 85, 032506 (2012); C6: Derevianko et al. 2001"},
    {"23Na87Rb", "23Na |1,1> + 87Rb |1,1>", 347.64 * GAUSS, 5.0 * GAUSS, 66.0 * CP_A0,
     2.0 * CP_MUB, 2683.0, 0,
     "B0: Guo et al., arXiv:2108.01856 (2021); width, abg: Wang et al., PRA 87, 050702(R) "
     "(2013); C6: Derevianko et al. 2001"},
    {"23Na133Cs", "23Na |1,1> + 133Cs |3,3>", 864.1 * GAUSS, 1.0 * GAUSS, 30.0 * CP_A0,
     2.0 * CP_MUB, 3256.0, 0,
     "B0 recalled [M] (candidate paper: Zhang et al., PRL 124, 253401 (2020)); width, abg and dmu "
     "are placeholders; C6: Brookes & Hutson, J. Phys. Chem. A (2022), arXiv:2203.10362"},
    {"6Li40K", "6Li |1> + 40K |9/2,-9/2>", 155.0 * GAUSS, 0.9 * GAUSS, 63.0 * CP_A0,
     2.0 * CP_MUB, 2322.0, 0, "Wille et al., PRL 100, 053201 (2008); C6: Derevianko et al. 2001"},
    {"6Li133Cs", "6Li |1> + 133Cs |3,3>", 843.0 * GAUSS, -58.0 * GAUSS, -29.0 * CP_A0,
     2.0 * CP_MUB, 3065.0, 0, "Tung et al., PRA 87, 010702(R) (2013); C6: Derevianko et al. 2001"},
    {"23Na6Li", "23Na |1,1> + 6Li |1>", 745.0 * GAUSS, -0.1 * GAUSS, -76.0 * CP_A0,
     2.0 * CP_MUB, 1467.0, 0,
     "B0: Heo et al., PRA 86, 021602(R) (2012), arXiv:1205.5304; C6: Derevianko et al. 2001"},
};
const size_t cp_resonance_table_size = sizeof cp_resonance_table / sizeof cp_resonance_table[0];
