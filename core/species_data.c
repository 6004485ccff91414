/*
 * The built-in species tables.  Sources:
 *  - atomic masses: AME2020, M. Wang et al., Chinese Phys. C 45, 030003 (2021), file
 *    mass_1.mas20 (checked);  nuclear spins: standard nuclear data (from memory).
 *  - molecules and resonances: the papers named in each record; values marked "[M]" were
 *    recalled from memory and must be verified before they are relied upon.
 * C6 of a polar molecule in J=0: C6 = C6_el + d^4/(6B) (a.u.; Julienne, Hanna, Idziaszek,
 * PCCP 13, 19114 (2011) [M]).  Where no published total is known the table holds the
 * rotational part computed from d and B plus C6_el ~ 1e4 a.u. [M], an estimate to ~10 %.
 */
#include "species_int.h"

#include "coldprep/consts.h"

/* Each atom's last two fields: a_bb, its own s-wave scattering length (m), and a_bb_source,
 * the hyperfine state it is for, its uncertainty and the paper; "[M]" where the number is
 * recalled rather than read from the source. */
const cp_atom cp_atom_table[] = {
    {"6Li", "Li", 3, 6, 6.01512288742, 1.0, "AME2020 mass; I [M]",
     -2160.0 * CP_A0,
     "triplet a_T, the high-field limit of the |1> + |2> mixture: Abraham et al., PRA 55, "
     "R3299 (1997) [M]"},
    {"7Li", "Li", 3, 7, 7.01600343426, 1.5, "AME2020 mass; I [M]",
     -27.3 * CP_A0,
     "|2,2> (pure triplet), -27.3(8) a0: Abraham et al., PRL 74, 1315 (1995), "
     "doi:10.1103/PhysRevLett.74.1315"},
    {"23Na", "Na", 11, 23, 22.98976928195, 1.5, "AME2020 mass; I [M]",
     55.4 * CP_A0,
     "|1,-1> at B = 0 (= |1,1> at B = 0), 55.4(1.2) a0: van Abeelen & Verhaar, PRA 59, 578 "
     "(1999), doi:10.1103/PhysRevA.59.578"},
    {"39K", "K", 19, 39, 38.96370648482, 1.5, "AME2020 mass; I [M]",
     -33.48 * CP_A0,
     "|2,2> (triplet a_T); |1,1> is near -30 a0 at low field and tuned by resonances near 33 G"
     " and 403 G: Falke et al., PRA 78, 012503 (2008), arXiv:0804.2949 [M]"},
    {"40K", "K", 19, 40, 39.963998165, 4.0, "AME2020 mass; I [M]",
     169.67 * CP_A0,
     "triplet a_T (|9/2,-9/2> + |9/2,-7/2> background): Falke et al., PRA 78, 012503 (2008), "
     "arXiv:0804.2949 [M]"},
    {"41K", "K", 19, 41, 40.96182525611, 1.5, "AME2020 mass; I [M]",
     60.54 * CP_A0,
     "|2,2> (triplet a_T): Falke et al., PRA 78, 012503 (2008), arXiv:0804.2949 [M]"},
    {"85Rb", "Rb", 37, 85, 84.91178973604, 2.5, "AME2020 mass; I [M]",
     -443.0 * CP_A0,
     "|2,-2>, background away from the 155 G resonance: Claussen et al., PRA 67, 060701(R) "
     "(2003) [M]"},
    {"87Rb", "Rb", 37, 87, 86.909180529, 1.5, "AME2020 mass; I [M]",
     100.40 * CP_A0,
     "|1,-1> (= |1,1> at B = 0); the triplet |2,2> value is 98.98 a0: van Kempen et al., PRL "
     "88, 093201 (2002) [M]"},
    {"133Cs", "Cs", 55, 133, 132.905451958, 3.5, "AME2020 mass; I [M]",
     2440.0 * CP_A0,
     "|4,4> (triplet a_T); |3,3> depends strongly on B (zero near 17 G, a few hundred a0 at "
     "20-50 G): give the value at the plan's field.  Chin et al., PRA 70, 032701 (2004) [M]"},
    {"84Sr", "Sr", 38, 84, 83.913419118, 0.0, "AME2020 mass; I [M]",
     122.7 * CP_A0,
     "1S0 (no hyperfine structure): Stein, Knoeckel & Tiemann, Eur. Phys. J. D 57, 171 (2010),"
     " arXiv:1001.2741 [M]"},
    {"87Sr", "Sr", 38, 87, 86.90887749454, 4.5, "AME2020 mass; I [M]",
     96.2 * CP_A0,
     "1S0, between two nuclear-spin states: Stein, Knoeckel & Tiemann, Eur. Phys. J. D 57, 171"
     " (2010), arXiv:1001.2741 [M]"},
    {"88Sr", "Sr", 38, 88, 87.905612253, 0.0, "AME2020 mass; I [M]",
     -1.4 * CP_A0,
     "1S0, -1.4(6) a0: Martinez de Escobar et al., PRA 78, 062708 (2008), arXiv:0808.3434"},
    {"173Yb", "Yb", 70, 173, 172.938216211, 2.5, "AME2020 mass; I [M]",
     10.55e-9,
     "1S0, between two nuclear-spin states, 10.55(11) nm: Kitagawa et al., PRA 77, 012719 "
     "(2008), arXiv:0708.0752"},
    {"174Yb", "Yb", 70, 174, 173.938867545, 0.0, "AME2020 mass; I [M]",
     5.55e-9,
     "1S0, 5.55(8) nm: Kitagawa et al., PRA 77, 012719 (2008), arXiv:0708.0752"},
};
const size_t cp_atom_table_size = sizeof cp_atom_table / sizeof cp_atom_table[0];

/* name, atoms, d (D), B (Hz), C6 (a.u.), reactive, source */
const cp_molecule cp_molecule_table[] = {
    {"40K87Rb", "40K", "87Rb", 0.574, 1.1139e9, 16130.0, 1,
     "d: Ni et al., Science 322, 231 (2008) [M]; B: Ospelkaus et al., PRL 104, 030402 (2010) "
     "[M]; C6: Kotochigova, New J. Phys. 12, 073041 (2010) [M]; reactive: Zuchowski & Hutson, "
     "PRA 81, 060703(R) (2010)"},
    {"23Na40K", "23Na", "40K", 2.72, 2.8217e9, 5.197e5, 0,
     "d: Park, Will, Zwierlein, PRL 114, 205302 (2015) [M]; B: Will et al., PRL 116, 225306 "
     "(2016) [M]; C6 = d^4/6B + 1e4 a.u. estimate [M]; non-reactive: Zuchowski & Hutson 2010"},
    {"87Rb133Cs", "87Rb", "133Cs", 1.225, 0.490174e9, 1.307e5, 0,
     "d: Molony et al., PRL 113, 255301 (2014) [M]; B: Gregory et al., PRA 94, 041403(R) "
     "(2016) [M]; C6 = d^4/6B + 1e4 a.u. estimate [M]; non-reactive: Zuchowski & Hutson 2010"},
    {"23Na87Rb", "23Na", "87Rb", 3.2, 2.0897e9, 1.328e6, 0,
     "d: Guo et al., PRL 116, 205303 (2016) [M]; B [M]; C6 = d^4/6B + 1e4 a.u. estimate [M]; "
     "non-reactive: Zuchowski & Hutson 2010"},
    {"23Na133Cs", "23Na", "133Cs", 4.6, 1.74e9, 6.771e6, 0,
     "d: theory, Aymar & Dulieu, J. Chem. Phys. 122, 204302 (2005) [M]; B from r_e [M]; "
     "C6 = d^4/6B + 1e4 a.u. estimate [M]; non-reactive: Zuchowski & Hutson 2010"},
    {"6Li40K", "6Li", "40K", 3.5, 8.78e9, 4.591e5, 1,
     "d: theory, Aymar & Dulieu 2005 [M]; B from r_e [M]; C6 = d^4/6B + 1e4 a.u. estimate "
     "[M]; reactive: Zuchowski & Hutson 2010"},
    {"6Li133Cs", "6Li", "133Cs", 5.5, 6.53e9, 3.692e6, 1,
     "d: Deiglmayr et al., PRA 82, 032503 (2010) [M]; B from r_e [M]; C6 = d^4/6B + 1e4 a.u. "
     "estimate [M]; reactive: Zuchowski & Hutson 2010"},
    {"23Na6Li", "23Na", "6Li", 0.5, 12.7e9, 3.7e3, 1,
     "d: theory ~0.5 D [M]; B from r_e [M]; C6 ~3.7e3 a.u. (electronic part dominates) [M]; "
     "reactive: Zuchowski & Hutson 2010"},
};
const size_t cp_molecule_table_size = sizeof cp_molecule_table / sizeof cp_molecule_table[0];

#define GAUSS 1e-4

/* All resonance parameters are recalled from memory ([M]); verified = 0 throughout.
 * c6_au is the atom-atom van der Waals C6 of the entrance pair in atomic units, recalled
 * ([M]) from the Derevianko/Porsev-type ab initio tables (e.g. A. Derevianko, J. F. Babb,
 * A. Dalgarno, PRA 63, 052704 (2001)); it sets the mean scattering length abar. */
const cp_resonance cp_resonance_table[] = {
    {"40K87Rb", "40K |9/2,-9/2> + 87Rb |1,1>", 546.7 * GAUSS, -3.04 * GAUSS, -187.0 * CP_A0,
     2.3 * CP_MUB, 4274.0, 0,
     "Ni et al., Science 322, 231 (2008); Zirbel et al., PRA 78, 013416 (2008); Klempt et al., "
     "PRA 76, 020701 (2007) [M]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"23Na40K", "23Na |1,1> + 40K |9/2,-5/2>", 138.7 * GAUSS, -1.0 * GAUSS, -700.0 * CP_A0,
     2.0 * CP_MUB, 2447.0, 0,
     "Park et al., PRA 85, 051602(R) (2012) [M, low confidence: B0 recalled, width, abg and dmu "
     "are order-of-magnitude recollections]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"87Rb133Cs", "87Rb |1,1> + 133Cs |3,3>", 197.1 * GAUSS, 0.6 * GAUSS, 650.0 * CP_A0,
     2.0 * CP_MUB, 5284.0, 0,
     "Takekoshi et al., PRA 85, 032506 (2012) [M; dmu not recalled, 2 muB assumed]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"23Na87Rb", "23Na |1,1> + 87Rb |1,1>", 347.6 * GAUSS, 5.0 * GAUSS, 66.0 * CP_A0,
     2.0 * CP_MUB, 2683.0, 0,
     "Wang et al., PRA 87, 010701(R) (2013) [M; dmu not recalled, 2 muB assumed]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"23Na133Cs", "23Na |1,1> + 133Cs |3,3>", 864.1 * GAUSS, 1.0 * GAUSS, 30.0 * CP_A0,
     2.0 * CP_MUB, 3227.0, 0,
     "Ni group (Harvard), 2019-2021 [M, very low confidence: only B0 recalled; width, abg and "
     "dmu are placeholders to be replaced by the user]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"6Li40K", "6Li |1> + 40K |9/2,-9/2>", 155.0 * GAUSS, 0.9 * GAUSS, 63.0 * CP_A0,
     2.0 * CP_MUB, 2322.0, 0,
     "Wille et al., PRL 100, 053201 (2008); Voigt et al., PRL 102, 020405 (2009) [M]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"6Li133Cs", "6Li |1> + 133Cs |3,3>", 843.0 * GAUSS, -58.0 * GAUSS, -29.0 * CP_A0,
     2.0 * CP_MUB, 3065.0, 0,
     "Repp et al., PRA 87, 010701(R) (2013); Tung et al., PRA 87, 010702(R) (2013) [M; dmu "
     "not recalled, 2 muB assumed]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
    {"23Na6Li", "23Na |1,1> + 6Li |1>", 745.0 * GAUSS, -0.1 * GAUSS, -76.0 * CP_A0,
     2.0 * CP_MUB, 1467.0, 0,
     "Heo et al., PRA 86, 021602(R) (2012) [M; width ~0.1 G recalled, sign set so that abg*width > 0; dmu not recalled, 2 muB assumed]; "
     "C6: Derevianko/Porsev-type atom-pair value [M]"},
};
const size_t cp_resonance_table_size = sizeof cp_resonance_table / sizeof cp_resonance_table[0];
