//! Raw grade data. Stresses in MPa (metric grades) or psi (inch grades);
//! diameters in mm or inches to match. Built into `GradeInfo` once.

use super::{GradeFamily, YieldBasis};

/// One size range of a grade, in the unit system of its standard.
pub(crate) struct RawRange {
    /// Smallest nominal diameter covered.
    pub min: f64,
    /// Whether `min` itself is covered ("over 3/4 in" excludes it).
    pub min_inclusive: bool,
    /// Largest nominal diameter covered (inclusive).
    pub max: f64,
    pub label: &'static str,
    pub rm: f64,
    pub yield_min: f64,
    pub proof: f64,
}

pub(crate) struct RawGrade {
    pub id: &'static str,
    pub name: &'static str,
    pub standard: &'static str,
    pub family: GradeFamily,
    pub yield_basis: YieldBasis,
    pub ranges: &'static [RawRange],
    pub notes: &'static [&'static str],
}

pub(crate) const fn r(
    min: f64,
    min_inclusive: bool,
    max: f64,
    label: &'static str,
    rm: f64,
    yield_min: f64,
    proof: f64,
) -> RawRange {
    RawRange {
        min,
        min_inclusive,
        max,
        label,
        rm,
        yield_min,
        proof,
    }
}

// ISO 898-1:2013 covers coarse threads M1.6 to M39 (scope, recalled from
// memory). Values: ISO 898-1:2013 mechanical properties table, as
// reproduced in two suppliers' technical tables (EN ISO 898-1).
const ISO898: &str = "ISO 898-1:2013, mechanical properties of bolts, screws and studs";
const ALL_ISO898: &str = "M1.6 to M39";
const ISO898_SPLIT_NOTE: &str =
    "ISO 898-1 fine threads are covered from M8x1 to M39x3 (recalled from memory)";

// ISO 3506-1:2009, austenitic A2/A4 (Rm, Rp0.2: recalled from memory, Rp0.2
// confirmed indirectly by supplier preload tables). Size limit for classes
// 70 and 80: M24 in the 2009 edition (recalled from memory; the 1997
// edition stopped at M20). ISO 3506-1 gives no proof stress for bolts: the
// 0.2 % proof strength Rp0.2 stands in for it.
const ISO3506: &str = "ISO 3506-1:2009, austenitic stainless steel bolts";
const STAINLESS_NOTE: &str =
    "ISO 3506-1 specifies no proof stress for bolts; the proof stress shown is Rp0.2 min";

// SAE J429, as reproduced in a supplier's technical tables and in the
// tables of Shigley's Mechanical Engineering Design (grades 2, 5, 8; psi).
const J429: &str = "SAE J429, mechanical requirements for inch bolts, screws and studs";
const GRADE2_NOTE: &str = "Grade 2 values for 1/4 to 3/4 in apply to bolts 6 in and shorter and to studs; longer bolts take Grade 1 values (SAE J429)";

// ASTM A574 socket head cap screws, as reproduced in two suppliers'
// technical tables (ksi given as psi). Yield: machined specimen 0.2 %
// offset. Size coverage #0 to 4 in (recalled from memory).
const A574: &str = "ASTM A574, alloy steel socket head cap screws";

// Inch bolting standards, values recalled from memory (ksi given as psi).
// A193 and A320 state tensile and yield strength but no proof load: the
// yield strength stands in for the proof stress.
const J429_MEM: &str = "SAE J429, mechanical requirements for inch bolts, screws and studs (values recalled from memory)";
const A193: &str = "ASTM A193, alloy steel bolting for high-temperature or high-pressure service (values recalled from memory)";
const A320: &str =
    "ASTM A320, alloy steel bolting for low-temperature service (values recalled from memory)";
const F3125: &str = "ASTM F3125, high-strength structural bolts (values recalled from memory)";
const A449: &str =
    "ASTM A449, quenched and tempered steel bolts and studs (values recalled from memory)";
const NO_PROOF_NOTE: &str =
    "the standard specifies no proof load; the proof stress shown is the minimum yield strength";

pub(crate) static GRADES: &[RawGrade] = &[
    RawGrade {
        id: "4.6",
        name: "property class 4.6",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::LowerYield,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 400.0, 240.0, 225.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    RawGrade {
        id: "4.8",
        name: "property class 4.8",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::FullSizeRpf,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 420.0, 340.0, 310.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    RawGrade {
        id: "5.6",
        name: "property class 5.6",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::LowerYield,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 500.0, 300.0, 280.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    RawGrade {
        id: "5.8",
        name: "property class 5.8",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::FullSizeRpf,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 520.0, 420.0, 380.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    RawGrade {
        id: "6.8",
        name: "property class 6.8",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::FullSizeRpf,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 600.0, 480.0, 440.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    RawGrade {
        id: "8.8",
        name: "property class 8.8",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[
            r(1.6, true, 16.0, "M1.6 to M16", 800.0, 640.0, 580.0),
            r(16.0, false, 39.0, "over M16 to M39", 830.0, 660.0, 600.0),
        ],
        notes: &[
            ISO898_SPLIT_NOTE,
            "the d ≤ 16 mm / d > 16 mm split does not apply to structural bolting (ISO 898-1 footnote)",
        ],
    },
    RawGrade {
        id: "9.8",
        name: "property class 9.8",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[r(1.6, true, 16.0, "M1.6 to M16", 900.0, 720.0, 650.0)],
        notes: &[
            ISO898_SPLIT_NOTE,
            "ISO 898-1 defines 9.8 only for d ≤ 16 mm",
        ],
    },
    RawGrade {
        id: "10.9",
        name: "property class 10.9",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 1040.0, 940.0, 830.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    RawGrade {
        id: "12.9",
        name: "property class 12.9",
        standard: ISO898,
        family: GradeFamily::Iso898,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[r(1.6, true, 39.0, ALL_ISO898, 1220.0, 1100.0, 970.0)],
        notes: &[ISO898_SPLIT_NOTE],
    },
    stainless("A2-50", "austenitic A2, class 50", S50),
    stainless("A2-70", "austenitic A2, class 70", S70),
    stainless("A2-80", "austenitic A2, class 80", S80),
    stainless("A4-50", "austenitic A4, class 50", S50),
    stainless("A4-70", "austenitic A4, class 70", S70),
    stainless("A4-80", "austenitic A4, class 80", S80),
    stainless("A1-50", "austenitic A1 (free-machining), class 50", S50),
    stainless("A1-70", "austenitic A1 (free-machining), class 70", S70),
    stainless("A1-80", "austenitic A1 (free-machining), class 80", S80),
    stainless("A3-50", "austenitic A3 (stabilised), class 50", S50),
    stainless("A3-70", "austenitic A3 (stabilised), class 70", S70),
    stainless("A3-80", "austenitic A3 (stabilised), class 80", S80),
    stainless("A5-50", "austenitic A5 (stabilised, Mo), class 50", S50),
    stainless("A5-70", "austenitic A5 (stabilised, Mo), class 70", S70),
    stainless("A5-80", "austenitic A5 (stabilised, Mo), class 80", S80),
    stainless100("A2-100", "austenitic A2, class 100"),
    stainless100("A4-100", "austenitic A4, class 100"),
    stainless100("A5-100", "austenitic A5 (stabilised, Mo), class 100"),
    RawGrade {
        id: "sae-j429-1",
        name: "SAE J429 Grade 1",
        standard: J429_MEM,
        family: GradeFamily::SaeJ429,
        yield_basis: YieldBasis::InchYield,
        ranges: &[r(0.25, true, 1.5, "1/4 to 1-1/2 in", 60_000.0, 36_000.0, 33_000.0)],
        notes: &[],
    },
    RawGrade {
        id: "sae-j429-8.2",
        name: "SAE J429 Grade 8.2",
        standard: J429_MEM,
        family: GradeFamily::SaeJ429,
        yield_basis: YieldBasis::InchYield,
        ranges: &[r(0.25, true, 1.0, "1/4 to 1 in", 150_000.0, 130_000.0, 120_000.0)],
        notes: &["Grade 8.2 is a low-carbon boron martensite steel; SAE J429 covers it to 1 in (recalled from memory)"],
    },
    RawGrade {
        id: "astm-a193-b7",
        name: "ASTM A193 Grade B7 stud or bolt",
        standard: A193,
        family: GradeFamily::AstmBolting,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[
            r(0.25, true, 2.5, "1/4 to 2-1/2 in", 125_000.0, 105_000.0, 105_000.0),
            r(2.5, false, 4.0, "over 2-1/2 to 4 in", 115_000.0, 95_000.0, 95_000.0),
            r(4.0, false, 7.0, "over 4 to 7 in", 100_000.0, 75_000.0, 75_000.0),
        ],
        notes: &[NO_PROOF_NOTE],
    },
    RawGrade {
        id: "astm-a193-b7m",
        name: "ASTM A193 Grade B7M stud or bolt (hardness limited)",
        standard: A193,
        family: GradeFamily::AstmBolting,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[r(0.25, true, 4.0, "1/4 to 4 in", 100_000.0, 80_000.0, 80_000.0)],
        notes: &[NO_PROOF_NOTE, "B7M: hardness limited to 235 HB for sour service (recalled from memory)"],
    },
    RawGrade {
        id: "astm-a320-l7",
        name: "ASTM A320 Grade L7 stud or bolt (low temperature)",
        standard: A320,
        family: GradeFamily::AstmBolting,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[r(0.25, true, 2.5, "1/4 to 2-1/2 in", 125_000.0, 105_000.0, 105_000.0)],
        notes: &[NO_PROOF_NOTE, "L7: impact tested at low temperature (ASTM A320)"],
    },
    RawGrade {
        id: "astm-f3125-a325",
        name: "ASTM F3125 Grade A325 structural bolt",
        standard: F3125,
        family: GradeFamily::AstmBolting,
        yield_basis: YieldBasis::InchYield,
        ranges: &[r(0.5, true, 1.5, "1/2 to 1-1/2 in", 120_000.0, 92_000.0, 85_000.0)],
        notes: &[],
    },
    RawGrade {
        id: "astm-f3125-a490",
        name: "ASTM F3125 Grade A490 structural bolt",
        standard: F3125,
        family: GradeFamily::AstmBolting,
        yield_basis: YieldBasis::InchYield,
        ranges: &[r(0.5, true, 1.5, "1/2 to 1-1/2 in", 150_000.0, 130_000.0, 120_000.0)],
        notes: &["A490 must not be hot-dip galvanized (ASTM F3125, recalled from memory)"],
    },
    RawGrade {
        id: "astm-a449",
        name: "ASTM A449 bolt or stud",
        standard: A449,
        family: GradeFamily::AstmBolting,
        yield_basis: YieldBasis::InchYield,
        ranges: &[
            r(0.25, true, 1.0, "1/4 to 1 in", 120_000.0, 92_000.0, 85_000.0),
            r(1.0, false, 1.5, "over 1 to 1-1/2 in", 105_000.0, 81_000.0, 74_000.0),
            r(1.5, false, 3.0, "over 1-1/2 to 3 in", 90_000.0, 58_000.0, 55_000.0),
        ],
        notes: &[],
    },
    RawGrade {
        id: "sae-j429-2",
        name: "SAE J429 Grade 2",
        standard: J429,
        family: GradeFamily::SaeJ429,
        yield_basis: YieldBasis::InchYield,
        ranges: &[
            r(0.25, true, 0.75, "1/4 to 3/4 in", 74_000.0, 57_000.0, 55_000.0),
            r(
                0.75,
                false,
                1.5,
                "over 3/4 to 1-1/2 in",
                60_000.0,
                36_000.0,
                33_000.0,
            ),
        ],
        notes: &[GRADE2_NOTE],
    },
    RawGrade {
        id: "sae-j429-5",
        name: "SAE J429 Grade 5",
        standard: J429,
        family: GradeFamily::SaeJ429,
        yield_basis: YieldBasis::InchYield,
        ranges: &[
            r(0.25, true, 1.0, "1/4 to 1 in", 120_000.0, 92_000.0, 85_000.0),
            r(
                1.0,
                false,
                1.5,
                "over 1 to 1-1/2 in",
                105_000.0,
                81_000.0,
                74_000.0,
            ),
        ],
        notes: &[],
    },
    RawGrade {
        id: "sae-j429-8",
        name: "SAE J429 Grade 8",
        standard: J429,
        family: GradeFamily::SaeJ429,
        yield_basis: YieldBasis::InchYield,
        ranges: &[r(
            0.25,
            true,
            1.5,
            "1/4 to 1-1/2 in",
            150_000.0,
            130_000.0,
            120_000.0,
        )],
        notes: &[],
    },
    RawGrade {
        id: "astm-a574",
        name: "ASTM A574 socket head cap screw",
        standard: A574,
        family: GradeFamily::AstmA574,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: &[
            r(0.06, true, 0.5, "#0 to 1/2 in", 180_000.0, 153_000.0, 140_000.0),
            r(
                0.5,
                false,
                4.0,
                "over 1/2 to 4 in",
                170_000.0,
                153_000.0,
                135_000.0,
            ),
        ],
        notes: &["yield is the machined-specimen 0.2 % offset value (ASTM A574)"],
    },
];

const S50: &[RawRange] = &[r(1.6, true, 39.0, "M1.6 to M39", 500.0, 210.0, 210.0)];
const S70: &[RawRange] = &[r(1.6, true, 24.0, "M1.6 to M24", 700.0, 450.0, 450.0)];
const S80: &[RawRange] = &[r(1.6, true, 24.0, "M1.6 to M24", 800.0, 600.0, 600.0)];

// ISO 3506-1:2020 adds property class 100 (Rm 1000 MPa, Rp0.2 800 MPa) for
// austenitic grades, to M24 (values and size limit recalled from memory).
const S100: &[RawRange] = &[r(1.6, true, 24.0, "M1.6 to M24", 1000.0, 800.0, 800.0)];

const fn stainless100(id: &'static str, name: &'static str) -> RawGrade {
    RawGrade {
        id,
        name,
        standard: "ISO 3506-1:2020, austenitic stainless steel bolts, property class 100 (values recalled from memory)",
        family: GradeFamily::Iso3506,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: S100,
        notes: &[STAINLESS_NOTE],
    }
}

const fn stainless(id: &'static str, name: &'static str, ranges: &'static [RawRange]) -> RawGrade {
    RawGrade {
        id,
        name,
        standard: ISO3506,
        family: GradeFamily::Iso3506,
        yield_basis: YieldBasis::ProofStrength02,
        ranges,
        notes: &[STAINLESS_NOTE],
    }
}
