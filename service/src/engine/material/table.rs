//! Raw material rows. Stresses in MPa.
//!
//! Elastic moduli: steel 205 000 MPa is the value VDI 2230 Part 1 uses for
//! steel (recalled from memory); the other moduli are typical handbook
//! values, recalled from memory. Limiting surface pressure p_G and the Rm
//! beside it: VDI 2230 Part 1:2003, Table A9 (table number recalled from
//! memory), as reproduced in a supplier's technical tables ("based on VDI 2230,
//! edition 2003"); values that page marks "not yet
//! checked against latest research" carry that note.

use super::MaterialKind;

/// Which row of the supplier engagement table a material reads.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum EngagementRow {
    /// S235 / C15, Rm > 360 MPa.
    MildSteel,
    /// E295 / S355 / C35 N, Rm > 500 MPa.
    StructuralSteel,
    /// C45 V, 34CrMo4 V, 42CrMo4 V (quenched and tempered), Rm > 800 MPa.
    QuenchedTempered,
    /// EN-GJL-250 grey cast iron, Rm > 220 MPa.
    GreyCastIron,
    /// Al 99.5 / AlMg3, Rm > 180 MPa (only the 8.8 columns are legible).
    Aluminium,
}

pub(crate) struct RawMaterial {
    pub id: &'static str,
    pub kind: MaterialKind,
    pub name: &'static str,
    /// Other spellings, compared after removing non-alphanumerics.
    pub aliases: &'static [&'static str],
    pub e: f64,
    pub p_g: Option<f64>,
    pub rm: Option<f64>,
    pub source: &'static str,
    pub row: EngagementRow,
    /// True when the material itself is a row of the engagement table;
    /// false when the row is the nearest conservative analogue.
    pub row_is_listed: bool,
}

const VDI2003: &str = "E: VDI 2230 Part 1 steel value 205 000 MPa (recalled from memory); p_G and Rm: VDI 2230 Part 1:2003 Table A9 (table number recalled from memory), as reproduced in a supplier's technical tables";
const VDI2003_UNCHECKED: &str = "E: typical value (recalled from memory); p_G and Rm: VDI 2230 Part 1:2003 Table A9 (table number recalled from memory), as reproduced in a supplier's technical tables, marked there 'not yet checked against latest research'";

pub(crate) static MATERIALS: &[RawMaterial] = &[
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "steel",
        name: "steel, generic (grade not stated)",
        aliases: &["steel generic"],
        e: 205_000.0,
        p_g: None,
        rm: None,
        source: "E: VDI 2230 Part 1 steel value 205 000 MPa (recalled from memory); no p_G or Rm without a named grade",
        row: EngagementRow::MildSteel,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "steel-s235",
        name: "structural steel S235JR (1.0036)",
        aliases: &["s235", "s235jr", "s235jrg1", "st37", "1.0036"],
        e: 205_000.0,
        p_g: Some(490.0),
        rm: Some(340.0),
        source: VDI2003,
        row: EngagementRow::MildSteel,
        row_is_listed: true,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "steel-e295",
        name: "steel E295 (1.0050)",
        aliases: &["e295", "st50", "1.0050"],
        e: 205_000.0,
        p_g: Some(710.0),
        rm: Some(470.0),
        source: VDI2003,
        row: EngagementRow::StructuralSteel,
        row_is_listed: true,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "steel-s355",
        name: "structural steel S355J0 (1.0553)",
        aliases: &["s355", "s355j0", "st52", "1.0553"],
        e: 205_000.0,
        p_g: Some(760.0),
        rm: Some(510.0),
        source: VDI2003,
        row: EngagementRow::StructuralSteel,
        row_is_listed: true,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "steel-c45",
        name: "steel C45 (1.1192)",
        aliases: &["c45", "cq45", "1.1192", "c45 q+t"],
        e: 205_000.0,
        p_g: Some(630.0),
        rm: Some(700.0),
        source: "E: VDI 2230 Part 1 steel value 205 000 MPa (recalled from memory); p_G 630 MPa and Rm 700 MPa: VDI 2230 Part 1:2003 Table A9 (table number recalled from memory), as reproduced in a supplier's technical tables, marked 'not yet checked against latest research'",
        row: EngagementRow::StructuralSteel,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "steel-42crmo4",
        name: "alloy steel 42CrMo4, quenched and tempered (1.7225)",
        aliases: &["42crmo4", "42crmo4 q+t", "42crmo4v", "1.7225"],
        e: 205_000.0,
        p_g: Some(850.0),
        rm: Some(1000.0),
        source: "E: VDI 2230 Part 1 steel value 205 000 MPa (recalled from memory); p_G 850 MPa and Rm 1000 MPa: VDI 2230:1986 limiting values (the 2003 table reproduced has no 42CrMo4 row), as reproduced in a supplier's technical tables and a bearing maker's design guide",
        row: EngagementRow::QuenchedTempered,
        row_is_listed: true,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "cast-iron-gjl-250",
        name: "grey cast iron EN-GJL-250 (GG-25)",
        aliases: &["en-gjl-250", "gjl-250", "gjl250", "gg25", "gg-25"],
        e: 110_000.0,
        p_g: Some(900.0),
        rm: Some(250.0),
        source: "E 110 000 MPa: typical for EN-GJL-250 (recalled from memory); p_G and Rm: VDI 2230 Part 1:2003 Table A9 (table number recalled from memory), as reproduced in a supplier's technical tables",
        row: EngagementRow::GreyCastIron,
        row_is_listed: true,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "ductile-iron-gjs-400",
        name: "ductile cast iron EN-GJS-400-15",
        aliases: &["en-gjs-400", "en-gjs-400-15", "gjs-400", "gjs400", "ggg40", "0.7040"],
        e: 169_000.0,
        p_g: Some(700.0),
        rm: Some(400.0),
        source: VDI2003_UNCHECKED,
        row: EngagementRow::GreyCastIron,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "aluminium-6082",
        name: "wrought aluminium alloy EN AW-6082 (AlMgSi1 F31)",
        aliases: &["en aw-6082", "aw-6082", "6082", "6082-t6", "almgsi1", "aluminum-6082"],
        e: 70_000.0,
        p_g: Some(260.0),
        rm: Some(290.0),
        source: VDI2003_UNCHECKED,
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "aluminium-alsi9cu3",
        name: "die-cast aluminium alloy GD-AlSi9Cu3",
        aliases: &["alsi9cu3", "gd-alsi9cu3", "en ac-46000", "aluminum-alsi9cu3"],
        e: 75_000.0,
        p_g: Some(290.0),
        rm: Some(240.0),
        source: VDI2003_UNCHECKED,
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "magnesium-az91",
        name: "magnesium alloy AZ91",
        aliases: &["az91", "az91d", "mgal9zn1"],
        e: 45_000.0,
        p_g: Some(280.0),
        rm: Some(310.0),
        source: VDI2003_UNCHECKED,
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "stainless-1.4301",
        name: "austenitic stainless steel X5CrNi18-10 (1.4301)",
        aliases: &["1.4301", "x5crni18-10", "304", "aisi 304"],
        e: 200_000.0,
        p_g: None,
        rm: Some(500.0),
        source: "E 200 000 MPa and Rm 500 MPa: typical for 1.4301 (recalled from memory); no p_G: the VDI 2230:2003 table reproduced lists X5CrNi18-12 (1.4303), not 1.4301 — give p_G explicitly",
        row: EngagementRow::MildSteel,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Metal,
        id: "stainless-1.4401",
        name: "austenitic stainless steel X5CrNiMo17-12-2 (1.4401)",
        aliases: &["1.4401", "x5crnimo17-12-2", "316", "aisi 316"],
        e: 200_000.0,
        p_g: Some(460.0),
        rm: Some(510.0),
        source: VDI2003_UNCHECKED,
        row: EngagementRow::MildSteel,
        row_is_listed: false,
    },
    // Outside the method: VDI 2230 covers metallic parts that behave
    // elastically; plastics creep and relax under preload and threaded
    // inserts carry the load through a second thread whose strength the
    // insert's maker states. These rows exist so that such joints can be
    // described and refused honestly; their E values serve only the angle
    // model and are typical values, recalled from memory.
    RawMaterial {
        kind: MaterialKind::Plastic,
        id: "plastic-pa66-gf30",
        name: "polyamide 66 with 30 % glass fibre (PA66-GF30), outside the method",
        aliases: &["pa66-gf30", "pa66gf30", "pa66 gf30", "nylon 66 gf30"],
        e: 7_000.0,
        p_g: None,
        rm: None,
        source: "E 7 000 MPa: typical for PA66-GF30, conditioned (recalled from memory); plastics are outside VDI 2230 Part 1 (metallic parts): no p_G, no thread-engagement rule",
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::Plastic,
        id: "plastic-pom",
        name: "polyoxymethylene (POM), outside the method",
        aliases: &["pom", "pom-c", "pom-h", "acetal"],
        e: 2_800.0,
        p_g: None,
        rm: None,
        source: "E 2 800 MPa: typical for POM (recalled from memory); plastics are outside VDI 2230 Part 1 (metallic parts): no p_G, no thread-engagement rule",
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::ThreadedInsert,
        id: "insert-in-plastic",
        name: "threaded insert (brass, moulded-in, heat-set or pressed) in a plastic part, outside the method",
        aliases: &["plastic insert", "insert plastic", "brass insert", "heat-set insert"],
        e: 100_000.0,
        p_g: None,
        rm: None,
        source: "E 100 000 MPa: typical for brass (recalled from memory); the insert's pull-out and torque-out strength is the maker's test value, outside VDI 2230 Part 1",
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
    RawMaterial {
        kind: MaterialKind::ThreadedInsert,
        id: "insert-helical-coil",
        name: "helical coil wire thread insert (stainless) in a metal part, outside the method",
        aliases: &["helical coil", "wire thread insert", "coil insert"],
        e: 200_000.0,
        p_g: None,
        rm: None,
        source: "E 200 000 MPa: typical for austenitic stainless wire (recalled from memory); the insert's stripping strength depends on the parent material and the insert length, stated by the insert's standard or maker, outside VDI 2230 Part 1",
        row: EngagementRow::Aluminium,
        row_is_listed: false,
    },
];
