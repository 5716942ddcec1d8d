//! Static thread tables: ISO 261 metric sizes and ASME B1.1 Unified sizes.

/// One ISO metric nominal size with its coarse pitch and fine pitches.
pub(crate) struct MetricSize {
    /// Nominal diameter d in mm, and as printed in a designation.
    pub d: f64,
    pub d_text: &'static str,
    /// Coarse pitch P in mm.
    pub coarse: f64,
    /// Fine pitches (mm, printed form), largest first.
    pub fine: &'static [(f64, &'static str)],
}

const fn m(
    d: f64,
    d_text: &'static str,
    coarse: f64,
    fine: &'static [(f64, &'static str)],
) -> MetricSize {
    MetricSize {
        d,
        d_text,
        coarse,
        fine,
    }
}

/// ISO 261 general-purpose metric screw threads, M1.6 to M64: first-choice
/// sizes and the common second choices (M3.5, M7, M14, M18, M22, M27, M33,
/// M39, M45, M52, M56, M60), coarse pitch and the fine pitches in common use.
/// Pitches: ISO 261, recalled from memory. M3–M39 coarse pitches agree with
/// the ISO 898-1 stress-area table (which prints each size with its pitch).
pub(crate) static METRIC: &[MetricSize] = &[
    m(1.6, "1.6", 0.35, &[(0.2, "0.2")]),
    m(2.0, "2", 0.4, &[(0.25, "0.25")]),
    m(2.5, "2.5", 0.45, &[(0.35, "0.35")]),
    m(3.0, "3", 0.5, &[(0.35, "0.35")]),
    m(3.5, "3.5", 0.6, &[(0.35, "0.35")]),
    m(4.0, "4", 0.7, &[(0.5, "0.5")]),
    m(5.0, "5", 0.8, &[(0.5, "0.5")]),
    m(6.0, "6", 1.0, &[(0.75, "0.75")]),
    m(7.0, "7", 1.0, &[(0.75, "0.75")]),
    m(8.0, "8", 1.25, &[(1.0, "1"), (0.75, "0.75")]),
    m(
        10.0,
        "10",
        1.5,
        &[(1.25, "1.25"), (1.0, "1"), (0.75, "0.75")],
    ),
    m(
        12.0,
        "12",
        1.75,
        &[(1.5, "1.5"), (1.25, "1.25"), (1.0, "1")],
    ),
    m(14.0, "14", 2.0, &[(1.5, "1.5"), (1.25, "1.25"), (1.0, "1")]),
    m(16.0, "16", 2.0, &[(1.5, "1.5"), (1.0, "1")]),
    m(18.0, "18", 2.5, &[(2.0, "2"), (1.5, "1.5"), (1.0, "1")]),
    m(20.0, "20", 2.5, &[(2.0, "2"), (1.5, "1.5"), (1.0, "1")]),
    m(22.0, "22", 2.5, &[(2.0, "2"), (1.5, "1.5"), (1.0, "1")]),
    m(24.0, "24", 3.0, &[(2.0, "2"), (1.5, "1.5"), (1.0, "1")]),
    m(27.0, "27", 3.0, &[(2.0, "2"), (1.5, "1.5"), (1.0, "1")]),
    m(
        30.0,
        "30",
        3.5,
        &[(3.0, "3"), (2.0, "2"), (1.5, "1.5"), (1.0, "1")],
    ),
    m(33.0, "33", 3.5, &[(3.0, "3"), (2.0, "2"), (1.5, "1.5")]),
    m(36.0, "36", 4.0, &[(3.0, "3"), (2.0, "2"), (1.5, "1.5")]),
    m(39.0, "39", 4.0, &[(3.0, "3"), (2.0, "2"), (1.5, "1.5")]),
    m(
        42.0,
        "42",
        4.5,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
    m(
        45.0,
        "45",
        4.5,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
    m(
        48.0,
        "48",
        5.0,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
    m(
        52.0,
        "52",
        5.0,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
    m(
        56.0,
        "56",
        5.5,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
    m(
        60.0,
        "60",
        5.5,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
    m(
        64.0,
        "64",
        6.0,
        &[(4.0, "4"), (3.0, "3"), (2.0, "2"), (1.5, "1.5")],
    ),
];

/// One Unified inch size.
pub(crate) struct UnifiedSize {
    /// Basic major diameter D in inches.
    pub d: f64,
    /// Size as printed: `#10`, `1/2`, `1-1/4`.
    pub name: &'static str,
    /// Threads per inch, coarse series (UNC).
    pub unc: Option<u32>,
    /// Threads per inch, fine series (UNF).
    pub unf: Option<u32>,
    /// Member of the 8-thread series (8-UN).
    pub un8: bool,
}

const fn u(d: f64, name: &'static str, unc: u32, unf: u32, un8: bool) -> UnifiedSize {
    UnifiedSize {
        d,
        name,
        unc: if unc == 0 { None } else { Some(unc) },
        unf: if unf == 0 { None } else { Some(unf) },
        un8,
    }
}

/// ASME B1.1 Unified inch screw threads: UNC and UNF #2 to 1-1/2 in, and the
/// 8-UN series from 1 in to 2 in. Numbered sizes: D = 0.060 + 0.013·N in
/// (ASME B1.1). Threads per inch: ASME B1.1, recalled from memory; the
/// #10–1-1/2 UNC and UNF pitches agree with the published stress-area tables.
pub(crate) static UNIFIED: &[UnifiedSize] = &[
    u(0.086, "#2", 56, 64, false),
    u(0.099, "#3", 48, 56, false),
    u(0.112, "#4", 40, 48, false),
    u(0.125, "#5", 40, 44, false),
    u(0.138, "#6", 32, 40, false),
    u(0.164, "#8", 32, 36, false),
    u(0.190, "#10", 24, 32, false),
    u(0.216, "#12", 24, 28, false),
    u(0.25, "1/4", 20, 28, false),
    u(0.3125, "5/16", 18, 24, false),
    u(0.375, "3/8", 16, 24, false),
    u(0.4375, "7/16", 14, 20, false),
    u(0.5, "1/2", 13, 20, false),
    u(0.5625, "9/16", 12, 18, false),
    u(0.625, "5/8", 11, 18, false),
    u(0.75, "3/4", 10, 16, false),
    u(0.875, "7/8", 9, 14, false),
    u(1.0, "1", 8, 12, true),
    u(1.125, "1-1/8", 7, 12, true),
    u(1.25, "1-1/4", 7, 12, true),
    u(1.375, "1-3/8", 6, 12, true),
    u(1.5, "1-1/2", 6, 12, true),
    u(1.625, "1-5/8", 0, 0, true),
    u(1.75, "1-3/4", 0, 0, true),
    u(1.875, "1-7/8", 0, 0, true),
    u(2.0, "2", 0, 0, true),
];

/// Diameters equal within this many mm (metric) or inches (Unified).
pub(crate) const SIZE_TOLERANCE: f64 = 0.0005;
