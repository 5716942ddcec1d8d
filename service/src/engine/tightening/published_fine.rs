//! Check against a published VDI 2230 table for ISO metric fine threads,
//! end to end through the thread, grade and bearing tables.
//!
//! Source: supplier catalogue table "Approximate values for metric fine
//! threads, preload and tightening torques", stated to be based on VDI 2230
//! (2001/2003 edition), property classes 8.8/10.9/12.9 to ISO 898-1, 90 %
//! utilisation of Rp0.2, μ_ges = μ_G = μ_K (as reproduced in a supplier's
//! technical tables).
//! Head and hole: hexagon head ISO 4017 product grade A d_w,min, ISO 273 medium
//! clearance hole (the basis such tables use; see the coarse-thread check in
//! `tests.rs`). Tolerances from the issue: preload within 1 %, torque within 2 %.

use uom::si::force::kilonewton;
use uom::si::torque::newton_meter;

use super::*;
use crate::engine::bearing::{bearing_surface, HeadType, HoleSeries, Washer};
use crate::engine::grade::strength_for;
use crate::engine::quantity::Utilisation;
use crate::engine::thread::parse_designation;

/// (thread, μ, [F_M 8.8, 10.9, 12.9] kN, [M_A 8.8, 10.9, 12.9] N·m), as printed.
#[rustfmt::skip]
const ROWS: &[(&str, f64, [f64; 3], [f64; 3])] = &[
    ("M8x1",     0.10, [20.7, 30.4, 35.6],   [22.8, 33.5, 39.2]),
    ("M8x1",     0.12, [20.2, 29.7, 34.7],   [26.1, 38.3, 44.9]),
    ("M8x1",     0.14, [19.7, 28.9, 33.9],   [29.2, 42.8, 50.1]),
    ("M10x1.25", 0.10, [32.4, 47.5, 55.6],   [44.0, 65.0, 76.0]),
    ("M10x1.25", 0.12, [31.6, 46.4, 54.3],   [51.0, 75.0, 87.0]),
    ("M10x1.25", 0.14, [30.8, 45.2, 52.9],   [57.0, 83.0, 98.0]),
    ("M12x1.25", 0.10, [49.1, 72.1, 84.4],   [79.0, 116.0, 135.0]),
    ("M12x1.25", 0.12, [48.0, 70.5, 82.5],   [90.0, 133.0, 155.0]),
    ("M12x1.25", 0.14, [46.8, 68.7, 80.4],   [101.0, 149.0, 174.0]),
    ("M14x1.5",  0.10, [66.4, 97.5, 114.1],  [124.0, 182.0, 213.0]),
    ("M14x1.5",  0.12, [64.8, 95.2, 111.4],  [142.0, 209.0, 244.0]),
    ("M14x1.5",  0.14, [63.2, 92.9, 108.7],  [159.0, 234.0, 274.0]),
    ("M16x1.5",  0.10, [89.6, 131.6, 154.0], [189.0, 278.0, 325.0]),
    ("M16x1.5",  0.12, [87.6, 128.7, 150.6], [218.0, 320.0, 374.0]),
    ("M16x1.5",  0.14, [85.5, 125.5, 146.9], [244.0, 359.0, 420.0]),
    ("M18x1.5",  0.10, [120.0, 171.0, 200.0], [283.0, 403.0, 472.0]),
    ("M18x1.5",  0.12, [117.0, 167.0, 196.0], [327.0, 465.0, 544.0]),
    ("M18x1.5",  0.14, [115.0, 163.0, 191.0], [368.0, 523.0, 613.0]),
    ("M20x1.5",  0.10, [151.0, 215.0, 252.0], [392.0, 558.0, 653.0]),
    ("M20x1.5",  0.12, [148.0, 211.0, 246.0], [454.0, 646.0, 756.0]),
    ("M20x1.5",  0.14, [144.0, 206.0, 241.0], [511.0, 728.0, 852.0]),
    ("M22x1.5",  0.10, [186.0, 264.0, 309.0], [529.0, 754.0, 882.0]),
    ("M22x1.5",  0.12, [182.0, 259.0, 303.0], [613.0, 873.0, 1022.0]),
    ("M22x1.5",  0.14, [178.0, 253.0, 296.0], [692.0, 985.0, 1153.0]),
    ("M24x2",    0.10, [213.0, 304.0, 355.0], [666.0, 949.0, 1110.0]),
    ("M24x2",    0.12, [209.0, 297.0, 348.0], [769.0, 1095.0, 1282.0]),
    ("M24x2",    0.14, [204.0, 290.0, 339.0], [865.0, 1232.0, 1442.0]),
];

#[test]
fn fine_thread_table_based_on_vdi_2230() {
    let classes = ["8.8", "10.9", "12.9"];
    let zero = Torque::new::<newton_meter>(0.0);
    let mut checked = 0;
    for &(designation, mu, preloads, torques) in ROWS {
        let thread = parse_designation(designation).expect("tabulated fine thread");
        let bearing = bearing_surface(
            &thread,
            HeadType::HexagonHead,
            Washer::None,
            HoleSeries::Medium,
        )
        .expect("tabulated head and hole");
        for (i, class) in classes.iter().enumerate() {
            let strength = strength_for(class, &thread).expect("class covers the size");
            let preload = permissible_preload(
                &thread,
                strength.yield_strength_min,
                Utilisation::DEFAULT,
                mu,
            );
            let torque = tightening_torque(&thread, preload, bearing.mean_diameter(), mu, mu, zero);
            let (f, m) = (preload.get::<kilonewton>(), torque.get::<newton_meter>());
            assert!(
                (f / preloads[i] - 1.0).abs() <= 0.01,
                "{designation} {class} μ {mu}: preload {f:.2} kN, table {}",
                preloads[i]
            );
            assert!(
                (m / torques[i] - 1.0).abs() <= 0.02,
                "{designation} {class} μ {mu}: torque {m:.1} N·m, table {}",
                torques[i]
            );
            checked += 1;
        }
    }
    assert_eq!(checked, 81);
}
