//! Provenance: no served text names a company, brand or supplier, or gives
//! a web address. Sources name the standard, table and edition, or say "as
//! reproduced in a supplier's technical tables", "recalled from memory" or
//! "common practice". The deny-list below is kept here and nowhere else.
//! Catalogue history is not checked: revision 1 is kept as it was written.

use serde_json::Value;

use crate::support::TestApp;

/// Makers and publishers of fasteners, coatings, lubricants and bearings
/// (whose tables a source might name) and of processors. Matched as whole
/// words, case-insensitive. Reference sites are web addresses, which the
/// address check below catches without naming them.
const DENIED: &[&str] = &[
    // fastener makers and distributors
    "würth",
    "wurth",
    "bossard",
    "fastenal",
    "mcmaster",
    "böllhoff",
    "boellhoff",
    "kamax",
    "nord-lock",
    "hilti",
    "unbrako",
    "arconic",
    "howmet",
    "lindapter",
    "spiralock",
    "superbolt",
    "nylok",
    "reyher",
    "bulten",
    "agrati",
    "ejot",
    "berner",
    "optimas",
    "mastik",
    "eicac",
    "fischer",
    "holo-krome",
    // coatings and lubricants
    "dörken",
    "doerken",
    "geomet",
    "dacromet",
    "delta-protekt",
    "atotech",
    "galvanizers association",
    "loctite",
    "henkel",
    "molykote",
    "klüber",
    "kluber",
    "castrol",
    "rocol",
    "never-seez",
    "copaslip",
    "permatex",
    "threebond",
    "precote",
    // bearing makers
    "skf",
    "schaeffler",
    "timken",
    "nsk",
    "ntn",
    "thyssenkrupp",
    "rothe erde",
    // processors
    "intel",
    "xeon",
    "amd",
    "epyc",
    "ryzen",
];

const TOP_LEVEL_DOMAINS: &[&str] = &[
    "com", "net", "org", "edu", "info", "io", "de", "pt", "se", "uk", "fr", "it", "ch", "jp", "cn",
    "eu",
];

fn is_word_char(c: Option<char>) -> bool {
    c.is_some_and(char::is_alphanumeric)
}

/// What is wrong with `text`, if anything.
fn offence(text: &str) -> Option<String> {
    let lower = text.to_lowercase();
    // the address markers are built, so this file holds no address itself
    if lower.contains("://") || lower.contains(&format!("{}.", "www")) {
        return Some("a web address".into());
    }
    for name in DENIED {
        for (at, _) in lower.match_indices(name) {
            let before = lower[..at].chars().next_back();
            let after = lower[at + name.len()..].chars().next();
            if !is_word_char(before) && !is_word_char(after) {
                return Some(format!("the name '{name}'"));
            }
        }
    }
    for tld in TOP_LEVEL_DOMAINS {
        let dotted = format!(".{tld}");
        for (at, _) in lower.match_indices(&dotted) {
            let before = lower[..at].chars().next_back();
            let after = lower[at + dotted.len()..].chars().next();
            if is_word_char(before) && !is_word_char(after) && after != Some('.') {
                return Some(format!("a domain ending in '{dotted}'"));
            }
        }
    }
    None
}

/// Every string in `v` (keys included) that offends, with its path.
fn offences(v: &Value, path: &str, found: &mut Vec<String>) {
    match v {
        Value::String(s) => {
            if let Some(why) = offence(s) {
                found.push(format!("{path}: {why} in {s:?}"));
            }
        }
        Value::Array(items) => {
            for (i, item) in items.iter().enumerate() {
                offences(item, &format!("{path}[{i}]"), found);
            }
        }
        Value::Object(map) => {
            for (k, item) in map {
                if let Some(why) = offence(k) {
                    found.push(format!("{path}: {why} in key {k:?}"));
                }
                offences(item, &format!("{path}.{k}"), found);
            }
        }
        _ => {}
    }
}

#[test]
fn the_check_catches_names_and_addresses_and_passes_plain_sources() {
    assert!(offence("as published by EICAC").is_some());
    assert!(offence("total friction, Bossard's worked example").is_some());
    assert!(offence(&format!("see {}://example.invalid/page", "https")).is_some());
    assert!(offence(&format!("see {}.example.invalid", "www")).is_some());
    assert!(offence(&format!(
        "as reproduced by {}.{} p. 678",
        "a-catalogue", "pt"
    ))
    .is_some());
    assert!(offence(&format!("as reproduced at {}.{}", "some-reference", "com")).is_some());
    assert!(offence("2-core VM, Intel Xeon").is_some());
    assert!(offence("VDI 2230 Part 1 (2003) Table A5, friction class B").is_none());
    assert!(offence("as reproduced in a supplier's technical tables").is_none());
    assert!(offence("ISO 898-1:2013, Table 4; e.g. M12 (recalled from memory)").is_none());
    assert!(offence("a window of standard tools, common practice").is_none());
}

/// The served texts: catalogue, reference data, the cautions and checks of a
/// spec and of setpoints, and the OpenAPI document.
const SERVED: &[&str] = &[
    "/v1/finishes",
    "/v1/lubricants",
    "/v1/friction-entries",
    "/v1/catalogue/export",
    "/v1/catalogue/revisions",
    "/v1/materials",
    "/v1/tightening-methods",
    "/v1/bearing-types",
    "/v1/property-classes",
    "/v1/property-classes/8.8",
    "/v1/property-classes/12.9",
    "/v1/threads",
    "/v1/threads/M12",
    "/v1/tightening-specs?thread=M12&property_class=8.8&finish=zinc-electroplated&lubricant=none",
    "/v1/tightening-specs?thread=M8&property_class=12.9&finish=zinc-flake&lubricant=light-oil\
     &tightening_method=torque-angle&clamp_length=40mm&clamped_material=steel-s355\
     &joint_outer_diameter=30mm",
    "/v1/setpoints?thread=M10&property_class=8.8&finish=plain&lubricant=light-oil",
    "/openapi.json",
];

async fn no_served_text_names_a_company_or_an_address(app: TestApp) {
    let mut found = Vec::new();
    let mut checked = 0;
    for path in SERVED {
        let r = app.get(path).await;
        let status = r.status().as_u16();
        let text = r.text().await.expect("body");
        // a refused example would check nothing: every path must answer
        assert_eq!(status, 200, "{path}: {text}");
        let body: Value = serde_json::from_str(&text).expect("JSON");
        offences(&body, path, &mut found);
        checked += text.len();
    }
    assert!(checked > 10_000, "too little text checked: {checked} bytes");
    assert!(
        found.is_empty(),
        "served texts name companies or addresses:\n{}",
        found.join("\n")
    );
}

#[tokio::test]
async fn served_texts_are_clean_sqlite() {
    no_served_text_names_a_company_or_an_address(TestApp::spawn().await).await;
}

#[tokio::test]
async fn served_texts_are_clean_postgres() {
    let app = TestApp::builder().postgres().await.spawn().await;
    no_served_text_names_a_company_or_an_address(app).await;
}
