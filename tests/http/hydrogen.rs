//! Coating processes and high strength: hot-dip galvanized 12.9 is outside
//! ISO 10684 (error); phosphated or otherwise acid-cleaned 12.9 carries the
//! ISO 4042 hydrogen-embrittlement warning. 10.9 gets neither. The finishes
//! come from the catalogue, so both backends are checked.

use serde_json::Value;

use crate::support::TestApp;

async fn checks(
    app: &TestApp,
    class: &str,
    finish: &str,
    lubricant: &str,
) -> Vec<(String, String)> {
    let path = format!(
        "/v1/tightening-specs?thread=M12&property_class={class}&finish={finish}&lubricant={lubricant}"
    );
    let r = app.get(&path).await;
    assert_eq!(r.status().as_u16(), 200, "{path}");
    let s: Value = r.json().await.expect("spec JSON");
    s["checks"]
        .as_array()
        .expect("checks")
        .iter()
        .map(|c| {
            assert!(
                c["message"]
                    .as_str()
                    .is_some_and(|m| m.len() > 40 && !m.contains("  ")),
                "{c}"
            );
            (
                c["code"].as_str().unwrap().to_string(),
                c["severity"].as_str().unwrap().to_string(),
            )
        })
        .collect()
}

fn has(found: &[(String, String)], code: &str, severity: &str) -> bool {
    found.iter().any(|(c, s)| c == code && s == severity)
}

async fn coating_process_checks(app: TestApp) {
    for lubricant in ["none", "mos2-paste"] {
        let found = checks(&app, "12.9", "hot-dip-galvanized", lubricant).await;
        assert!(
            has(&found, "hot_dip_galvanized_class_not_covered", "error"),
            "{found:?}"
        );
        assert!(
            !found
                .iter()
                .any(|(c, _)| c == "acid_cleaning_hydrogen_risk"),
            "{found:?}"
        );
    }
    let found = checks(&app, "12.9", "phosphate-oil", "none").await;
    assert!(
        has(&found, "acid_cleaning_hydrogen_risk", "warning"),
        "{found:?}"
    );
    assert!(!found
        .iter()
        .any(|(c, _)| c == "hot_dip_galvanized_class_not_covered"));
    // ISO 10684 covers 10.9; the acid-cleaning warning starts at 12.9
    for finish in ["hot-dip-galvanized", "phosphate-oil"] {
        let found = checks(&app, "10.9", finish, "none").await;
        assert!(
            !found
                .iter()
                .any(|(c, _)| c == "hot_dip_galvanized_class_not_covered"
                    || c == "acid_cleaning_hydrogen_risk"),
            "{finish}: {found:?}"
        );
    }
    // zinc flake is neither
    let found = checks(&app, "12.9", "zinc-flake", "none").await;
    assert!(
        !found
            .iter()
            .any(|(c, _)| c.contains("hot_dip") || c.contains("acid")),
        "{found:?}"
    );
}

#[tokio::test]
async fn coating_process_checks_sqlite() {
    coating_process_checks(TestApp::spawn().await).await;
}

#[tokio::test]
async fn coating_process_checks_postgres() {
    coating_process_checks(TestApp::builder().postgres().await.spawn().await).await;
}
