//! Grades for metric bolts above M39, where ISO 898-1 and ISO 3506-1 stop:
//! the metric editions of the ASTM bolting standards (ASTM A193/A193M and
//! A320/A320M). Stresses in MPa, diameters in mm. These standards set the
//! strengths by nominal diameter only, not by pitch, so coarse and fine
//! threads are both covered (recalled from memory). They state tensile and
//! yield strength but no proof load: the yield strength stands in for the
//! proof stress.

use super::table::{r, RawGrade, RawRange};
use super::{GradeFamily, YieldBasis};

const A193M: &str = "ASTM A193/A193M, alloy and stainless steel bolting for high-temperature or high-pressure service, metric values (recalled from memory)";
const A320M: &str = "ASTM A320/A320M, alloy steel bolting for low-temperature service, metric values (recalled from memory)";
const NO_PROOF: &str =
    "the standard specifies no proof load; the proof stress shown is the minimum yield strength";
const BY_DIAMETER: &str =
    "strengths depend on the nominal diameter only; coarse and fine threads alike (recalled from memory)";

// ASTM A193M B7: Rm 860 / Rp0.2 720 MPa to M64, 795 / 655 over M64 to M100,
// 690 / 515 over M100 to M180 (recalled from memory).
const B7: &[RawRange] = &[
    r(1.6, true, 64.0, "up to M64", 860.0, 720.0, 720.0),
    r(64.0, false, 100.0, "over M64 to M100", 795.0, 655.0, 655.0),
    r(
        100.0,
        false,
        180.0,
        "over M100 to M180",
        690.0,
        515.0,
        515.0,
    ),
];
// ASTM A193M B7M: Rm 690 / Rp0.2 550 MPa to M100 (recalled from memory).
const B7M: &[RawRange] = &[r(1.6, true, 100.0, "up to M100", 690.0, 550.0, 550.0)];
// ASTM A320M L7: Rm 860 / Rp0.2 725 MPa to M64 (recalled from memory).
const L7: &[RawRange] = &[r(1.6, true, 64.0, "up to M64", 860.0, 725.0, 725.0)];
// ASTM A193M B8 and B8M class 1 (carbide solution treated): Rm 515 /
// Rp0.2 205 MPa at every diameter; tabulated here to M100 (recalled from
// memory).
const B8_CLASS1: &[RawRange] = &[r(1.6, true, 100.0, "up to M100", 515.0, 205.0, 205.0)];

pub(crate) static GRADES: &[RawGrade] = &[
    RawGrade {
        id: "astm-a193m-b7",
        name: "ASTM A193M Grade B7 stud or bolt (metric)",
        standard: A193M,
        family: GradeFamily::AstmBoltingMetric,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: B7,
        notes: &[NO_PROOF, BY_DIAMETER],
    },
    RawGrade {
        id: "astm-a193m-b7m",
        name: "ASTM A193M Grade B7M stud or bolt (metric, hardness limited)",
        standard: A193M,
        family: GradeFamily::AstmBoltingMetric,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: B7M,
        notes: &[
            NO_PROOF,
            BY_DIAMETER,
            "B7M: hardness limited to 235 HB for sour service (recalled from memory)",
        ],
    },
    RawGrade {
        id: "astm-a320m-l7",
        name: "ASTM A320M Grade L7 stud or bolt (metric, low temperature)",
        standard: A320M,
        family: GradeFamily::AstmBoltingMetric,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: L7,
        notes: &[
            NO_PROOF,
            BY_DIAMETER,
            "L7: impact tested at low temperature (ASTM A320/A320M)",
        ],
    },
    RawGrade {
        id: "astm-a193m-b8-1",
        name: "ASTM A193M Grade B8 class 1 stud or bolt (metric, austenitic stainless, solution treated)",
        standard: A193M,
        family: GradeFamily::AstmBoltingMetric,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: B8_CLASS1,
        notes: &[NO_PROOF, BY_DIAMETER, "B8 is an austenitic CrNi stainless steel (type 304)"],
    },
    RawGrade {
        id: "astm-a193m-b8m-1",
        name: "ASTM A193M Grade B8M class 1 stud or bolt (metric, austenitic stainless with Mo, solution treated)",
        standard: A193M,
        family: GradeFamily::AstmBoltingMetric,
        yield_basis: YieldBasis::ProofStrength02,
        ranges: B8_CLASS1,
        notes: &[NO_PROOF, BY_DIAMETER, "B8M is an austenitic CrNiMo stainless steel (type 316)"],
    },
];

/// The metric grades that cover diameters above ISO 898-1's M39.
pub(crate) const ABOVE_M39_STEEL: &[&str] = &["astm-a193m-b7", "astm-a193m-b7m", "astm-a320m-l7"];
/// The metric stainless grades that cover diameters above ISO 3506-1's M39.
pub(crate) const ABOVE_M39_STAINLESS: &[&str] = &["astm-a193m-b8-1", "astm-a193m-b8m-1"];

/// The metric counterpart of an inch ASTM bolting grade, if any.
pub(crate) fn metric_counterpart(inch_id: &str) -> Option<&'static str> {
    match inch_id {
        "astm-a193-b7" => Some("astm-a193m-b7"),
        "astm-a193-b7m" => Some("astm-a193m-b7m"),
        "astm-a320-l7" => Some("astm-a320m-l7"),
        _ => None,
    }
}
