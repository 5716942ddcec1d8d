//! Bearing and clearance-hole tables. Metric rows in mm, inch rows in inches.
//! Each table names its standard; rows not confirmed by a published
//! reproduction are marked "recalled from memory" (see `MEM_FROM`).

/// ISO 273 clearance holes: (d, fine, medium, coarse), mm. M3–M16 as
/// reproduced in a supplier's technical tables ("conform to ISO 273"); the other
/// rows are recalled from memory.
pub(crate) static ISO273: &[(f64, f64, f64, f64)] = &[
    (1.6, 1.7, 1.8, 2.0),
    (2.0, 2.2, 2.4, 2.6),
    (2.5, 2.7, 2.9, 3.1),
    (3.0, 3.2, 3.4, 3.6),
    (3.5, 3.7, 3.9, 4.2),
    (4.0, 4.3, 4.5, 4.8),
    (5.0, 5.3, 5.5, 5.8),
    (6.0, 6.4, 6.6, 7.0),
    (7.0, 7.4, 7.6, 8.0),
    (8.0, 8.4, 9.0, 10.0),
    (10.0, 10.5, 11.0, 12.0),
    (12.0, 13.0, 13.5, 14.5),
    (14.0, 15.0, 15.5, 16.5),
    (16.0, 17.0, 17.5, 18.5),
    (18.0, 19.0, 20.0, 21.0),
    (20.0, 21.0, 22.0, 24.0),
    (22.0, 23.0, 24.0, 26.0),
    (24.0, 25.0, 26.0, 28.0),
    (27.0, 28.0, 30.0, 32.0),
    (30.0, 31.0, 33.0, 35.0),
    (33.0, 34.0, 36.0, 38.0),
    (36.0, 37.0, 39.0, 42.0),
    (39.0, 40.0, 42.0, 45.0),
    (42.0, 43.0, 45.0, 48.0),
    (45.0, 46.0, 48.0, 52.0),
    (48.0, 50.0, 52.0, 56.0),
    (52.0, 54.0, 56.0, 62.0),
    (56.0, 58.0, 62.0, 66.0),
    (60.0, 62.0, 66.0, 70.0),
    (64.0, 66.0, 70.0, 74.0),
];

/// ISO 273 rows confirmed by the published reproduction (M3 to M16).
pub(crate) fn iso273_published(d: f64) -> bool {
    (3.0..=16.0).contains(&d) && d != 3.5 && d != 7.0
}

/// Hexagon head (ISO 4014 / ISO 4017) and hexagon nut (ISO 4032):
/// (d, s, d_w,min product grade A, d_w,min product grade B), mm; 0 = not
/// tabulated. M3–M10 d_w: a manufacturer's ISO 4017 table (as reproduced in a supplier's technical tables);
/// M12 and above, and M1.6–M2.5, recalled from memory (grade A M12–M24
/// agrees with VDI 2230-based torque tables back-calculated).
pub(crate) static ISO4017: &[(f64, f64, f64, f64)] = &[
    (1.6, 3.2, 2.27, 2.3),
    (2.0, 4.0, 3.07, 2.95),
    (2.5, 5.0, 4.07, 3.95),
    (3.0, 5.5, 4.57, 4.45),
    (4.0, 7.0, 5.88, 5.74),
    (5.0, 8.0, 6.88, 6.74),
    (6.0, 10.0, 8.88, 8.74),
    (8.0, 13.0, 11.63, 11.47),
    (10.0, 16.0, 14.63, 14.47),
    (12.0, 18.0, 16.63, 16.47),
    (14.0, 21.0, 19.64, 19.15),
    (16.0, 24.0, 22.49, 22.0),
    (18.0, 27.0, 25.34, 24.85),
    (20.0, 30.0, 28.19, 27.7),
    (22.0, 34.0, 31.71, 31.35),
    (24.0, 36.0, 33.61, 33.25),
    (27.0, 41.0, 0.0, 38.0),
    (30.0, 46.0, 0.0, 42.75),
    (33.0, 50.0, 0.0, 46.55),
    (36.0, 55.0, 0.0, 51.11),
    (39.0, 60.0, 0.0, 55.86),
    // M42–M64, product grade B (ISO 4014/4017 and ISO 4032 run to M64),
    // recalled from memory.
    (42.0, 65.0, 0.0, 59.95),
    (45.0, 70.0, 0.0, 64.7),
    (48.0, 75.0, 0.0, 69.45),
    (52.0, 80.0, 0.0, 74.2),
    (56.0, 85.0, 0.0, 78.66),
    (60.0, 90.0, 0.0, 83.41),
    (64.0, 95.0, 0.0, 88.16),
];

/// ISO 4017 d_w rows confirmed by the published reproduction (M3 to M10).
pub(crate) fn iso4017_published(d: f64) -> bool {
    (3.0..=10.0).contains(&d)
}

/// Socket head cap screws ISO 4762: (d, d_k,max, d_w,min), mm. d_k,max as
/// reproduced in an engineering reference table; d_w,min recalled from memory.
pub(crate) static ISO4762: &[(f64, f64, f64)] = &[
    (3.0, 5.5, 5.07),
    (4.0, 7.0, 6.53),
    (5.0, 8.5, 8.03),
    (6.0, 10.0, 9.38),
    (8.0, 13.0, 12.33),
    (10.0, 16.0, 15.33),
    (12.0, 18.0, 17.23),
    (14.0, 21.0, 20.17),
    (16.0, 24.0, 23.17),
    (18.0, 27.0, 25.87),
    (20.0, 30.0, 28.87),
    (22.0, 33.0, 31.81),
    (24.0, 36.0, 34.81),
    (27.0, 40.0, 38.61),
    (30.0, 45.0, 43.61),
    (33.0, 50.0, 48.49),
    (36.0, 54.0, 52.54),
    (39.0, 58.0, 56.43),
];

/// Hexagon flange bolts ISO 4162: (d, d_c max, d_w min), mm, M5 to M20.
/// Recalled from memory, not confirmed by a published reproduction.
pub(crate) static ISO4162: &[(f64, f64, f64)] = &[
    (5.0, 11.8, 9.8),
    (6.0, 14.2, 12.2),
    (8.0, 18.0, 15.8),
    (10.0, 22.3, 19.6),
    (12.0, 26.6, 23.8),
    (14.0, 30.5, 27.6),
    (16.0, 35.0, 31.9),
    (20.0, 43.0, 39.9),
];

/// Hexagon nuts with flange ISO 4161: (d, d_c max, d_w min), mm, M5 to
/// M20. Recalled from memory, not confirmed by a published reproduction.
pub(crate) static ISO4161: &[(f64, f64, f64)] = &[
    (5.0, 11.8, 9.8),
    (6.0, 14.2, 12.2),
    (8.0, 17.9, 15.8),
    (10.0, 21.8, 19.6),
    (12.0, 26.0, 23.8),
    (14.0, 29.9, 27.6),
    (16.0, 34.5, 31.9),
    (20.0, 42.8, 39.9),
];

/// Plain washers ISO 7089 (normal series; ISO 7090, chamfered, has the same
/// d1, d2 and h from M5): (d, d1 min inner, d2 max outer, h nominal), mm,
/// M1.6 to M64. Recalled from memory.
pub(crate) static ISO7089: &[(f64, f64, f64, f64)] = &[
    (1.6, 1.7, 4.0, 0.3),
    (2.0, 2.2, 5.0, 0.3),
    (2.5, 2.7, 6.0, 0.5),
    (3.0, 3.2, 7.0, 0.5),
    (4.0, 4.3, 9.0, 0.8),
    (5.0, 5.3, 10.0, 1.0),
    (6.0, 6.4, 12.0, 1.6),
    (8.0, 8.4, 16.0, 1.6),
    (10.0, 10.5, 20.0, 2.0),
    (12.0, 13.0, 24.0, 2.5),
    (14.0, 15.0, 28.0, 2.5),
    (16.0, 17.0, 30.0, 3.0),
    (18.0, 19.0, 34.0, 3.0),
    (20.0, 21.0, 37.0, 3.0),
    (22.0, 23.0, 39.0, 3.0),
    (24.0, 25.0, 44.0, 4.0),
    (27.0, 28.0, 50.0, 4.0),
    (30.0, 31.0, 56.0, 4.0),
    (33.0, 34.0, 60.0, 5.0),
    (36.0, 37.0, 66.0, 5.0),
    (39.0, 42.0, 72.0, 6.0),
    (42.0, 45.0, 78.0, 8.0),
    (45.0, 48.0, 85.0, 8.0),
    (48.0, 52.0, 92.0, 8.0),
    (52.0, 56.0, 98.0, 8.0),
    (56.0, 62.0, 105.0, 10.0),
    (60.0, 66.0, 110.0, 10.0),
    (64.0, 70.0, 115.0, 10.0),
];

/// Inch clearance holes ASME B18.2.8 close / normal / loose fit, mapped to
/// fine / medium / coarse: (D, close, normal, loose), inches. Recalled from
/// memory.
pub(crate) static B18_2_8: &[(f64, f64, f64, f64)] = &[
    (0.086, 0.094, 0.104, 0.116),
    (0.112, 0.120, 0.130, 0.150),
    (0.138, 0.147, 0.161, 0.180),
    (0.164, 0.173, 0.194, 0.209),
    (0.190, 0.201, 0.221, 0.250),
    (0.25, 0.266, 0.281, 0.312),
    (0.3125, 0.328, 0.344, 0.375),
    (0.375, 0.397, 0.406, 0.438),
    (0.4375, 0.469, 0.500, 0.562),
    (0.5, 0.531, 0.562, 0.625),
    (0.5625, 0.594, 0.625, 0.688),
    (0.625, 0.656, 0.688, 0.781),
    (0.75, 0.781, 0.812, 0.938),
    (0.875, 0.906, 0.938, 1.062),
    (1.0, 1.031, 1.062, 1.250),
    (1.125, 1.156, 1.188, 1.375),
    (1.25, 1.281, 1.312, 1.500),
    (1.375, 1.406, 1.438, 1.625),
    (1.5, 1.531, 1.562, 1.750),
];

/// ASME B18.2.1 hex cap screws: (D, width across flats F min), inches, as
/// reproduced in two suppliers' technical tables. Bearing face is
/// taken as F min (assumption: B18.2.1's washer-face diameter is about F
/// min, recalled from memory; the reproductions do not print it).
pub(crate) static B18_2_1_HEX: &[(f64, f64)] = &[
    (0.25, 0.428),
    (0.3125, 0.489),
    (0.375, 0.551),
    (0.4375, 0.612),
    (0.5, 0.736),
    (0.5625, 0.798),
    (0.625, 0.922),
    (0.75, 1.100),
    (0.875, 1.285),
    (1.0, 1.469),
    (1.125, 1.631),
    (1.25, 1.812),
    (1.375, 1.994),
    (1.5, 2.175),
];

/// ASME B18.2.1 heavy hex screws: (D, F min), inches, as reproduced in
/// a supplier's technical tables; bearing face taken as F min (same assumption).
pub(crate) static B18_2_1_HEAVY: &[(f64, f64)] = &[
    (0.375, 0.669),
    (0.5, 0.850),
    (0.625, 1.031),
    (0.75, 1.212),
    (0.875, 1.394),
    (1.0, 1.575),
    (1.125, 1.756),
    (1.25, 1.938),
    (1.375, 2.119),
    (1.5, 2.300),
];

/// ASME B18.2.2 hex nuts: (D, width across flats F basic, F min),
/// inches, 1/4 to 1-1/2 in. Recalled from memory. The bearing face is taken
/// as F min (the assumption made for the B18.2.1 heads).
pub(crate) static B18_2_2_HEX: &[(f64, f64, f64)] = &[
    (0.25, 0.4375, 0.428),
    (0.3125, 0.5, 0.489),
    (0.375, 0.5625, 0.551),
    (0.4375, 0.6875, 0.675),
    (0.5, 0.75, 0.736),
    (0.5625, 0.875, 0.861),
    (0.625, 0.9375, 0.922),
    (0.75, 1.125, 1.088),
    (0.875, 1.3125, 1.269),
    (1.0, 1.5, 1.450),
    (1.125, 1.6875, 1.631),
    (1.25, 1.875, 1.812),
    (1.375, 2.0625, 1.994),
    (1.5, 2.25, 2.175),
];

/// ASME B18.2.2 heavy hex nuts: (D, F basic = 1.5·D + 1/8 in, F min),
/// inches, 1/4 to 1-1/2 in (the standard continues to 4 in; the inch
/// clearance holes here stop at 1-1/2 in). Recalled from memory; bearing
/// face taken as F min.
pub(crate) static B18_2_2_HEAVY: &[(f64, f64, f64)] = &[
    (0.25, 0.5, 0.488),
    (0.3125, 0.5625, 0.546),
    (0.375, 0.6875, 0.669),
    (0.4375, 0.75, 0.728),
    (0.5, 0.875, 0.850),
    (0.5625, 0.9375, 0.909),
    (0.625, 1.0625, 1.031),
    (0.75, 1.25, 1.212),
    (0.875, 1.4375, 1.394),
    (1.0, 1.625, 1.575),
    (1.125, 1.8125, 1.756),
    (1.25, 2.0, 1.938),
    (1.375, 2.1875, 2.119),
    (1.5, 2.375, 2.300),
];

/// ASME B18.3 socket head cap screws: (D, head diameter A max), inches.
/// Recalled from memory. The bearing face is taken as A max, an upper
/// estimate (the head edge is rounded).
pub(crate) static B18_3: &[(f64, f64)] = &[
    (0.086, 0.140),
    (0.112, 0.183),
    (0.138, 0.226),
    (0.164, 0.270),
    (0.190, 0.312),
    (0.25, 0.375),
    (0.3125, 0.469),
    (0.375, 0.562),
    (0.4375, 0.656),
    (0.5, 0.750),
    (0.625, 0.938),
    (0.75, 1.125),
    (0.875, 1.312),
    (1.0, 1.500),
    (1.125, 1.688),
    (1.25, 1.875),
    (1.375, 2.062),
    (1.5, 2.250),
];

/// ASME B18.22.1 type A plain washers, narrow series: (D, inner diameter,
/// outer diameter), inches. Recalled from memory.
pub(crate) static B18_22_1: &[(f64, f64, f64)] = &[
    (0.25, 0.281, 0.625),
    (0.3125, 0.344, 0.688),
    (0.375, 0.406, 0.812),
    (0.4375, 0.469, 0.922),
    (0.5, 0.531, 1.062),
    (0.5625, 0.594, 1.156),
    (0.625, 0.656, 1.312),
    (0.75, 0.812, 1.469),
    (0.875, 0.938, 1.750),
    (1.0, 1.062, 2.000),
    (1.125, 1.250, 2.250),
    (1.25, 1.375, 2.500),
    (1.375, 1.500, 2.750),
    (1.5, 1.625, 3.000),
];

/// Row look-up by nominal diameter (same unit as the table).
pub(crate) fn row<T: Copy>(table: &[T], d: f64, key: impl Fn(&T) -> f64) -> Option<T> {
    table.iter().copied().find(|r| (key(r) - d).abs() < 5e-4)
}
