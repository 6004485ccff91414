/*
 * Provenance of the built-in species data (species_data.c): the publications, and one
 * entry per tabulated value giving its paper, status, uncertainty and whether the number
 * was checked against the paper's text.  "verified" is 1 only where the number itself was
 * read in the paper (abstract or text); "[M]" in a note means the number was recalled and
 * not seen in the paper, even where the paper is identified.  DOIs of the American Physical
 * Society journals follow the journal's pattern (10.1103/<journal>.<volume>.<page>).
 */
#include "species_int.h"

const cp_reference cp_reference_table[] = {
    {"AME2020", "M. Wang, W. J. Huang, F. G. Kondev, G. Audi, S. Naimi", "Chinese Phys. C", "45",
     "030003", 2021, "10.1088/1674-1137/abddaf", NULL},
    {"Stone2005", "N. J. Stone", "At. Data Nucl. Data Tables", "90", "75", 2005,
     "10.1016/j.adt.2005.04.001", NULL},
    {"Holmgren2010", "W. F. Holmgren, M. C. Revelle, V. P. A. Lonij, A. D. Cronin",
     "Phys. Rev. A", "81", "053607", 2010, "10.1103/PhysRevA.81.053607", "1001.3888"},
    {"AminiGould2003", "J. M. Amini, H. Gould", "Phys. Rev. Lett.", "91", "153001", 2003,
     "10.1103/PhysRevLett.91.153001", "physics/0305074"},
    {"Ni2008", "K.-K. Ni, S. Ospelkaus, M. H. G. de Miranda, A. Pe'er, B. Neyenhuis, et al.",
     "Science", "322", "231", 2008, "10.1126/science.1163861", "0808.2963"},
    {"Ospelkaus2010hf", "S. Ospelkaus, K.-K. Ni, G. Quemener, B. Neyenhuis, D. Wang, et al.",
     "Phys. Rev. Lett.", "104", "030402", 2010, "10.1103/PhysRevLett.104.030402", "0908.3931"},
    {"Ospelkaus2010", "S. Ospelkaus, K.-K. Ni, D. Wang, M. H. G. de Miranda, B. Neyenhuis, et al.",
     "Science", "327", "853", 2010, "10.1126/science.1184121", "0912.3854"},
    {"Kotochigova2010", "S. Kotochigova", "New J. Phys.", "12", "073041", 2010,
     "10.1088/1367-2630/12/7/073041", NULL},
    {"ZuchowskiHutson2010", "P. S. Zuchowski, J. M. Hutson", "Phys. Rev. A", "81", "060703(R)",
     2010, "10.1103/PhysRevA.81.060703", NULL},
    {"Park2015", "J. W. Park, S. A. Will, M. W. Zwierlein", "New J. Phys.", "17", "075016", 2015,
     "10.1088/1367-2630/17/7/075016", NULL},
    {"Will2016", "S. A. Will, J. W. Park, Z. Z. Yan, H. Loh, M. W. Zwierlein", "Phys. Rev. Lett.",
     "116", "225306", 2016, "10.1103/PhysRevLett.116.225306", NULL},
    {"Molony2014", "P. K. Molony, P. D. Gregory, Z. Ji, B. Lu, M. P. Koppinger, et al.",
     "Phys. Rev. Lett.", "113", "255301", 2014, "10.1103/PhysRevLett.113.255301", "1409.1485"},
    {"Gregory2016", "P. D. Gregory, J. Aldegunde, J. M. Hutson, S. L. Cornish", "Phys. Rev. A",
     "94", "041403(R)", 2016, "10.1103/PhysRevA.94.041403", "1608.03303"},
    {"Guo2016", "M. Guo, B. Zhu, B. Lu, X. Ye, F. Wang, R. Vexiau, et al.", "Phys. Rev. Lett.",
     "116", "205303", 2016, "10.1103/PhysRevLett.116.205303", "1602.03947"},
    {"Guo2018", "M. Guo, X. Ye, J. He, G. Quemener, D. Wang", "Phys. Rev. A", "97", "020501(R)",
     2018, "10.1103/PhysRevA.97.020501", "1801.00108"},
    {"AymarDulieu2005", "M. Aymar, O. Dulieu", "J. Chem. Phys.", "122", "204302", 2005,
     "10.1063/1.1903944", "quant-ph/0502059"},
    {"Deiglmayr2010", "J. Deiglmayr, A. Grochola, M. Repp, O. Dulieu, R. Wester, M. Weidemuller",
     "Phys. Rev. A", "82", "032503", 2010, "10.1103/PhysRevA.82.032503", NULL},
    {"JulienneHannaIdziaszek2011", "P. S. Julienne, T. M. Hanna, Z. Idziaszek",
     "Phys. Chem. Chem. Phys.", "13", "19114", 2011, "10.1039/c1cp21270b", NULL},
    {"Derevianko2001", "A. Derevianko, J. F. Babb, A. Dalgarno", "Phys. Rev. A", "63", "052704",
     2001, "10.1103/PhysRevA.63.052704", "physics/0102030"},
    {"Zirbel2008", "J. J. Zirbel, K.-K. Ni, S. Ospelkaus, T. L. Nicholson, M. L. Olsen, et al.",
     "Phys. Rev. A", "78", "013416", 2008, "10.1103/PhysRevA.78.013416", "0712.3889"},
    {"Park2012", "J. W. Park, C.-H. Wu, I. Santiago, T. G. Tiecke, S. Will, P. Ahmadi, "
                 "M. W. Zwierlein",
     "Phys. Rev. A", "85", "051602(R)", 2012, "10.1103/PhysRevA.85.051602", "1110.4552"},
    {"Takekoshi2012", "T. Takekoshi, M. Debatin, R. Rameshan, F. Ferlaino, R. Grimm, et al.",
     "Phys. Rev. A", "85", "032506", 2012, "10.1103/PhysRevA.85.032506", NULL},
    {"Wang2013", "F. Wang, D. Xiong, X. Li, D. Wang, E. Tiemann", "Phys. Rev. A", "87",
     "050702(R)", 2013, "10.1103/PhysRevA.87.050702", NULL},
    {"Guo2021", "Z. Guo, F. Jia, B. Zhu, L. Li, J. M. Hutson, D. Wang", "arXiv preprint",
     "2108.01856", "v1", 2021, NULL, "2108.01856"},
    {"Wille2008", "E. Wille, F. M. Spiegelhalder, G. Kerner, D. Naik, A. Trenkwalder, et al.",
     "Phys. Rev. Lett.", "100", "053201", 2008, "10.1103/PhysRevLett.100.053201", "0711.2916"},
    {"Tung2013", "S.-K. Tung, C. Parker, J. Johansen, C. Chin, Y. Wang, P. S. Julienne",
     "Phys. Rev. A", "87", "010702(R)", 2013, "10.1103/PhysRevA.87.010702", "1211.2888"},
    {"Heo2012", "M.-S. Heo, T. T. Wang, C. A. Christensen, T. M. Rvachov, D. A. Cotta, et al.",
     "Phys. Rev. A", "86", "021602(R)", 2012, "10.1103/PhysRevA.86.021602", "1205.5304"},
    {"Gregory2019", "P. D. Gregory, M. D. Frye, J. A. Blackmore, E. M. Bridge, R. Sawant, et al.",
     "Nat. Commun.", "10", "3104", 2019, "10.1038/s41467-019-11033-y", "1904.00654"},
    {"BrookesHutson2022", "S. G. H. Brookes, J. M. Hutson", "J. Phys. Chem. A", "126",
     "(page not read)", 2022, "10.1021/acs.jpca.2c01810", "2203.10362"},
    {"Zhang2020", "J. T. Zhang, Y. Yu, W. B. Cairncross, K. Wang, L. R. B. Picard, et al.",
     "Phys. Rev. Lett.", "124", "253401", 2020, "10.1103/PhysRevLett.124.253401", "2003.07850"},
    {"Neyenhuis2012", "B. Neyenhuis, B. Yan, S. A. Moses, J. P. Covey, A. Chotia, et al.",
     "Phys. Rev. Lett.", "109", "230403", 2012, "10.1103/PhysRevLett.109.230403", "1209.2226"},
    {"Blackmore2020", "J. A. Blackmore, R. Sawant, P. D. Gregory, S. L. Bromley, J. Aldegunde, "
                      "J. M. Hutson, S. L. Cornish",
     "Phys. Rev. A", "102", "053316", 2020, "10.1103/PhysRevA.102.053316", "2007.01762"},
    {"Gregory2021", "P. D. Gregory, J. A. Blackmore, S. L. Bromley, J. M. Hutson, S. L. Cornish",
     "Nat. Phys.", "17", "1149", 2021, "10.1038/s41567-021-01328-7", NULL},
    {"AldegundeHutson2017", "J. Aldegunde, J. M. Hutson", "Phys. Rev. A", "96", "042506", 2017,
     "10.1103/PhysRevA.96.042506", NULL},
    {"LadjimiTomza2024", "H. Ladjimi, M. Tomza", "Phys. Rev. A", "109", "052814", 2024,
     "10.1103/PhysRevA.109.052814", NULL},
    {"Feng2026", "K. Feng, H. Yang, H. J. Jozwiak, T. Karman", "arXiv preprint", "2607.25774",
     "v2", 2026, NULL, "2607.25774"},
};
const size_t cp_reference_table_size = sizeof cp_reference_table / sizeof cp_reference_table[0];

#define MEAS CP_DATA_MEASURED
#define CALC CP_DATA_CALCULATED
#define EST CP_DATA_ESTIMATED

/* Every atom: AME2020 mass and the ground-state nuclear spin. */
#define ATOM(name)                                                                             \
    {name, "mass_u", 0.0, MEAS, 0, "AME2020",                                                  \
     "file mass_1.mas20; checked against the file when the table was written, not re-read "    \
     "for this entry"},                                                                        \
    {name, "nuclear_spin", 0.0, MEAS, 0, "Stone2005", "ground-state spin; table not re-read"}

/* Single-oscillator estimate of the 1064 nm polarizability from a measured static one. */
#define POL_EST(name, ref, what, unc)                                                          \
    {name, "pol_1064_au", unc, EST, 0, ref,                                                    \
     "alpha0 / (1 - (lambda_D/1064 nm)^2) with " what " and the D1:D2 = 1:2 weighted "         \
     "centroid lambda_D of the vacuum D lines [M]; the core polarizability is treated as "     \
     "resonant, so the estimate runs ~1-2 % high; uncertainty taken as 3 %"}

/* Atom-pair C6 of a resonance's entrance channel: Derevianko et al. 2001 (<~1 %). */
#define PAIR_C6(rec, c6)                                                                       \
    {rec, "c6_au", 0.01 * (c6), CALC, 0, "Derevianko2001",                                     \
     "table of heteronuclear C6; the paper bounds the uncertainty at about 1 %; number "       \
     "recalled [M], not read in the table"}

/* The four resonance parameters attributed to one paper, none read in its text. */
#define RES4(rec, ref, note)                                                                   \
    {rec, "b0", 0.0, MEAS, 0, ref, note},                                                      \
    {rec, "width", 0.0, MEAS, 0, ref, note},                                                   \
    {rec, "abg", 0.0, CALC, 0, ref, note},                                                     \
    {rec, "dmu", 0.0, CALC, 0, ref, note}

/* The estimated molecular C6 (species_data.c): rotational part from the paper, electronic
 * part a round number of the project's own. */
#define C6_EST                                                                                 \
    "d^4/(6B) from the tabulated d and B (the rotational part) plus C6_el = 1e4 a.u., the "    \
    "project's own round number for the electronic part (no published value used); ~10 %"

#define NONREACTIVE "2AB -> A2 + B2 endothermic (their Table I); flag not re-read"

/* A number read only where someone else transcribed it, not in the paper itself. */
#define SECONDARY "transcribed in a secondary source, not read in the paper"

/* The Neyenhuis et al. 2012 polarizabilities are light shifts per intensity, U = -alpha I;
 * in atomic units alpha = alpha_h * h c / (2 pi a0^3) with alpha_h in Hz/(W/m^2). */
#define KRB_POL(field, what)                                                                   \
    {"40K87Rb", field, 0.0, MEAS, 0, "Neyenhuis2012",                                          \
     what " at 1064 nm, " SECONDARY " (a molecular-structure code's data module citing the "   \
     "paper: alpha_par = 10.0e-5, alpha_perp = 3.3e-5 MHz/(W/cm^2), U = -alpha I); converted " \
     "with alpha[a.u.] = alpha[Hz/(W/m^2)] h c / (2 pi a0^3); no uncertainty transcribed"}

const cp_datum cp_datum_table[] = {
    ATOM("6Li"), ATOM("7Li"), ATOM("23Na"), ATOM("39K"), ATOM("40K"), ATOM("41K"), ATOM("85Rb"),
    ATOM("87Rb"), ATOM("133Cs"), ATOM("84Sr"), ATOM("87Sr"), ATOM("88Sr"), ATOM("173Yb"),
    ATOM("174Yb"),
    POL_EST("23Na", "Holmgren2010", "alpha0 = 24.11e-24 cm^3 (read in the abstract)", 7.0),
    POL_EST("39K", "Holmgren2010", "alpha0 = 43.06e-24 cm^3 (read in the abstract)", 18.0),
    POL_EST("40K", "Holmgren2010", "alpha0 = 43.06e-24 cm^3 (read in the abstract)", 18.0),
    POL_EST("41K", "Holmgren2010", "alpha0 = 43.06e-24 cm^3 (read in the abstract)", 18.0),
    POL_EST("85Rb", "Holmgren2010", "alpha0 = 47.24e-24 cm^3 (read in the abstract)", 21.0),
    POL_EST("87Rb", "Holmgren2010", "alpha0 = 47.24e-24 cm^3 (read in the abstract)", 21.0),
    POL_EST("133Cs", "AminiGould2003", "alpha0 = 401.0(6) a0^3 (read in the abstract)", 36.0),

    /* 40K87Rb */
    {"40K87Rb", "dipole_debye", 0.017, MEAS, 1, "Ni2008",
     "Stark spectroscopy of X1Sigma+ v=0: 0.566(17) D (abstract)"},
    {"40K87Rb", "rot_const_hz", 0.0, MEAS, 0, "Ospelkaus2010hf",
     "microwave spectroscopy of N=0 -> 1; 1113.950 MHz " SECONDARY " (two data modules citing "
     "the paper agree; one also lists 1113.9514 MHz from Neyenhuis et al. 2012); was 1113.9 MHz "
     "recalled"},
    /* A second data module gives KRb as alpha^(0) = 5.53e-5 and alpha^(2) = 4.47e-5
     * MHz/(W/cm^2): alpha^(0) = (alpha_par + 2 alpha_perp)/3 and alpha^(2) = 2 (alpha_par -
     * alpha_perp)/3 reproduce the first module's pair, which fixes the normalisation used
     * for RbCs below. */
    KRB_POL("pol_1064_par_au", "alpha_parallel (along the molecular axis) = 2133.504 a.u."),
    KRB_POL("pol_1064_perp_au", "alpha_perpendicular = 704.056 a.u."),
    KRB_POL("pol_1064_au", "isotropic part (alpha_par + 2 alpha_perp)/3 = 1180.539 a.u., the "
                           "polarizability of N = 0"),
    {"40K87Rb", "c6_au", 0.0, CALC, 0, "Kotochigova2010", "16130 a.u. recalled [M]"},
    {"40K87Rb", "reactive", 0.0, MEAS, 1, "Ospelkaus2010",
     "\"experimental evidence for exothermic atom-exchange chemical reactions\" of ground-state "
     "KRb (abstract); the energetics of all ten bialkalis: Zuchowski & Hutson 2010"},
    {"40K87Rb", "loss_rate", 0.75e-18, MEAS, 0, "Ospelkaus2010",
     "spin-polarised fermions, p-wave: beta/T = 1.2(3)e-5 cm^3 s^-1 K^-1 recalled [M] (the "
     "abstract, read, gives no number), "
     "evaluated at 250 nK (beta grows in proportion to T)"},
    {"40K87Rb", "loss_temperature", 0.0, MEAS, 0, "Ospelkaus2010",
     "the temperature the recalled beta/T is evaluated at [M]"},

    /* 23Na40K */
    {"23Na40K", "dipole_debye", 0.0, MEAS, 1, "Park2015",
     "2.72 D as stated in the abstract (a value quoted there, not measured in that paper)"},
    {"23Na40K", "rot_const_hz", 0.0, MEAS, 0, "Will2016",
     "2.8217297 GHz, " SECONDARY " (two data modules citing the paper agree); was 2.8217 GHz "
     "recalled"},
    {"23Na40K", "c6_au", 0.0, EST, 0, "JulienneHannaIdziaszek2011", C6_EST},
    {"23Na40K", "reactive", 0.0, MEAS, 1, "Park2015",
     "ground-state NaK molecules \"are chemically stable under binary collisions\" "
     "(abstract)"},

    /* 87Rb133Cs */
    {"87Rb133Cs", "dipole_debye", 0.0085, MEAS, 1, "Molony2014",
     "1.225(3)(8) D, statistical and systematic added in quadrature (abstract)"},
    {"87Rb133Cs", "rot_const_hz", 0.0, MEAS, 0, "Gregory2021",
     "490.173994 MHz from the supplementary constants of this paper, " SECONDARY " (a data "
     "module citing it); the value recalled before from Gregory et al. 2016 was 490.174 MHz; "
     "Molony et al. 2014 give the N=0 -> 2 splitting 2940.09(6) MHz, i.e. 6B to within the "
     "hyperfine shifts"},
#define RBCS_POL(field, what)                                                                  \
    {"87Rb133Cs", field, 0.0, MEAS, 0, "Blackmore2020",                                        \
     what " at 1064 nm, " SECONDARY " (data modules of a molecular-structure code citing the " \
     "paper: alpha^(0) = 2020 a.u., alpha^(2) = 1997 a.u.); alpha_par = alpha^(0) + "          \
     "alpha^(2), alpha_perp = alpha^(0) - alpha^(2)/2, with alpha^(2) = 2 (alpha_par - "       \
     "alpha_perp)/3 as that code's KRb entries show (the paper's own normalisation not read)"}
    RBCS_POL("pol_1064_au", "isotropic part alpha^(0) = 2020 a.u., the polarizability of N = 0"),
    RBCS_POL("pol_1064_par_au", "alpha_parallel = 4017 a.u."),
    RBCS_POL("pol_1064_perp_au", "alpha_perpendicular = 1021.5 a.u."),
    {"87Rb133Cs", "c6_au", 0.0, EST, 0, "JulienneHannaIdziaszek2011", C6_EST},
    {"87Rb133Cs", "reactive", 0.0, MEAS, 1, "Gregory2019",
     "\"nonreactive ultracold 87Rb133Cs molecules\" (abstract); they are still lost in "
     "sticky two-body collisions, at a rate below the universal limit (same abstract; the "
     "rate itself was not read and is not built in)"},

    /* 23Na87Rb */
    {"23Na87Rb", "dipole_debye", 0.0, MEAS, 0, "Guo2016",
     "Stark shifts of the ground state; 3.2 D recalled [M]; a data module lists 3.2 D for NaRb "
     "too (citing Guo et al. 2018), not read in either paper"},
    {"23Na87Rb", "rot_const_hz", 0.0, MEAS, 0, "Guo2018",
     "2.0896628 GHz, " SECONDARY " (two data modules citing the paper agree); was 2.0897 GHz "
     "recalled"},
    {"23Na87Rb", "c6_au", 0.0, EST, 0, "JulienneHannaIdziaszek2011", C6_EST},
    {"23Na87Rb", "reactive", 0.0, CALC, 0, "ZuchowskiHutson2010", NONREACTIVE},

    /* 23Na133Cs */
    {"23Na133Cs", "dipole_debye", 0.0, CALC, 0, "AymarDulieu2005",
     "ab initio, X1Sigma+ v=0; 4.6 D recalled [M]"},
    {"23Na133Cs", "rot_const_hz", 0.0, CALC, 0, "AldegundeHutson2017",
     "1.7396 GHz, " SECONDARY " (one data module citing the paper; another lists 0.962 GHz, "
     "which cannot be right: Feng et al., arXiv:2607.25774, Table 1, read, give B_e = 1.74 GHz "
     "for NaCs from the spectroscopic potential of Docenko et al. 2004); was 1.74 GHz recalled"},
    {"23Na133Cs", "c6_au", 0.0, EST, 0, "JulienneHannaIdziaszek2011", C6_EST},
    {"23Na133Cs", "reactive", 0.0, CALC, 0, "ZuchowskiHutson2010", NONREACTIVE},

    /* 6Li40K */
    {"6Li40K", "dipole_debye", 0.0, CALC, 0, "AymarDulieu2005",
     "3.6 D as quoted from this paper by Ridinger et al. (arXiv:1108.0618, read there); "
     "the paper's own table not read"},
    {"6Li40K", "rot_const_hz", 0.0, EST, 0, NULL,
     "from the equilibrium distance, recalled [M]; no paper identified"},
    {"6Li40K", "c6_au", 0.0, EST, 0, "JulienneHannaIdziaszek2011", C6_EST},
    {"6Li40K", "reactive", 0.0, CALC, 0, "ZuchowskiHutson2010",
     "2LiK -> Li2 + K2 exothermic (their Table I); flag not re-read"},

    /* 6Li133Cs */
    {"6Li133Cs", "dipole_debye", 0.0, MEAS, 0, "Deiglmayr2010",
     "Stark spectroscopy of the ground state; 5.5 D recalled [M]"},
    {"6Li133Cs", "rot_const_hz", 0.0, EST, 0, NULL,
     "from the equilibrium distance, recalled [M]; no paper identified"},
    {"6Li133Cs", "c6_au", 0.0, EST, 0, "JulienneHannaIdziaszek2011", C6_EST},
    {"6Li133Cs", "reactive", 0.0, CALC, 0, "ZuchowskiHutson2010",
     "2LiCs -> Li2 + Cs2 exothermic (their Table I); flag not re-read"},

    /* 23Na6Li */
    {"23Na6Li", "dipole_debye", 0.0, CALC, 0, "LadjimiTomza2024",
     "0.47 D, the equilibrium value d_e (v = 0 differs by d'(r_e) <r - r_e>, a few mD with "
     "d'(r_e) = 0.049 D/a0 from the same table), " SECONDARY ": read in Feng et al., "
     "arXiv:2607.25774, Table 1, which quotes it from this paper; was ~0.5 D recalled"},
    {"23Na6Li", "rot_const_hz", 0.0, EST, 0, NULL,
     "from the equilibrium distance, recalled [M]; no paper identified"},
    {"23Na6Li", "c6_au", 0.0, EST, 0, NULL,
     "electronic part dominates; ~3.7e3 a.u. recalled [M]; no paper identified"},
    {"23Na6Li", "reactive", 0.0, CALC, 0, "ZuchowskiHutson2010",
     "2NaLi -> Na2 + Li2 exothermic (their Table I); flag not re-read"},

    /* resonances: "<molecule>#<index>" */
    RES4("40K87Rb#1", "Zirbel2008",
         "546.7 G, -3.04 G, -187 a0, 2.3 muB recalled [M]; a_bg and dmu may come from the "
         "coupled-channel model the paper uses"),
    PAIR_C6("40K87Rb#1", 4274.0),
    RES4("23Na40K#1", "Park2012",
         "low confidence: B0 = 138.7 G recalled [M]; width, a_bg and dmu are order-of-"
         "magnitude recollections"),
    PAIR_C6("23Na40K#1", 2447.0),
    RES4("87Rb133Cs#1", "Takekoshi2012",
         "197.1 G, 0.6 G, 650 a0 recalled [M]; dmu = 2 muB assumed, not from the paper"),
    PAIR_C6("87Rb133Cs#1", 5284.0),
    {"23Na87Rb#1", "b0", 0.0, MEAS, 1, "Guo2021",
     "\"the most commonly used Feshbach resonance near 347.64 G between 23Na and 87Rb in "
     "their absolute ground states\" (abstract), i.e. Na |1,1> + Rb |1,1>"},
    {"23Na87Rb#1", "width", 0.0, MEAS, 0, "Wang2013", "5.0 G recalled [M]"},
    {"23Na87Rb#1", "abg", 0.0, CALC, 0, "Wang2013", "66 a0 recalled [M]"},
    {"23Na87Rb#1", "dmu", 0.0, CALC, 0, "Wang2013", "2 muB assumed, not from the paper [M]"},
    PAIR_C6("23Na87Rb#1", 2683.0),
    {"23Na133Cs#1", "b0", 0.0, MEAS, 0, "Zhang2020",
     "864.1 G recalled [M]; Zhang et al. (title and authors read) magnetoassociate single "
     "NaCs molecules on a Na+Cs resonance, but its position was not read there"},
    {"23Na133Cs#1", "width", 0.0, EST, 0, NULL,
     "placeholder, no paper identified [M]: replace by a calibration"},
    {"23Na133Cs#1", "abg", 0.0, EST, 0, NULL,
     "placeholder, no paper identified [M]: replace by a calibration"},
    {"23Na133Cs#1", "dmu", 0.0, EST, 0, NULL,
     "2 muB placeholder, no paper identified [M]: replace by a calibration"},
    {"23Na133Cs#1", "c6_au", 1.0, CALC, 1, "BrookesHutson2022",
     "\"C6 must be increased by about 0.9% to 3256(1) Eh a0^6 to fit the experimental "
     "results\" (abstract): fitted to tweezer spectroscopy and scattering; it replaces the "
     "Derevianko et al. 2001 value 3227 a.u. used before"},
    RES4("6Li40K#1", "Wille2008",
         "155.0 G, 0.9 G, 63 a0 recalled [M]; dmu = 2 muB assumed; the entrance channel "
         "(K |9/2,-9/2> here) is recalled too and may be K |9/2,-5/2>: check the paper's "
         "table before use"),
    PAIR_C6("6Li40K#1", 2322.0),
    RES4("6Li133Cs#1", "Tung2013",
         "the abstract says two resonances are as wide as 6 mT (60 G), consistent with "
         "|width| = 58 G; 843.0 G, -58 G, -29 a0 recalled [M]; dmu = 2 muB assumed"),
    PAIR_C6("6Li133Cs#1", 3065.0),
    {"23Na6Li#1", "b0", 0.0, MEAS, 1, "Heo2012",
     "\"a narrow Feshbach resonance at 745 G\" used to form NaLi molecules (abstract); the "
     "abstract does not name the entrance states"},
    {"23Na6Li#1", "width", 0.0, MEAS, 0, "Heo2012",
     "~0.1 G recalled [M] (the abstract only says \"narrow\"), its sign set so that "
     "a_bg * width > 0"},
    {"23Na6Li#1", "abg", 0.0, CALC, 0, "Heo2012", "-76 a0 recalled [M]"},
    {"23Na6Li#1", "dmu", 0.0, CALC, 0, "Heo2012", "2 muB assumed, not from the paper [M]"},
    PAIR_C6("23Na6Li#1", 1467.0),
};
const size_t cp_datum_table_size = sizeof cp_datum_table / sizeof cp_datum_table[0];
