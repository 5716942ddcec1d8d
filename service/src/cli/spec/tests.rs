use super::*;
use clap::Parser;

#[derive(Parser)]
struct T {
    #[command(flatten)]
    args: SpecArgs,
}

fn args(extra: &[&str]) -> SpecArgs {
    let mut v = vec![
        "t",
        "--thread",
        "M12",
        "--property-class",
        "8.8",
        "--builtin-catalogue",
    ];
    v.extend_from_slice(extra);
    T::parse_from(v).args
}

#[tokio::test]
async fn table_and_json_from_the_same_computation() {
    let a = args(&[
        "--thread-friction",
        "0.14",
        "--bearing-friction",
        "0.14",
        "--tool-scatter",
        "0",
    ]);
    let text = run(&a).await.unwrap();
    assert!(text.contains("Tightening specification: M12 8.8"), "{text}");
    assert!(text.contains("ISO 16047"), "{text}");
    let mut j = a.clone();
    j.json = true;
    let json: serde_json::Value = serde_json::from_str(&run(&j).await.unwrap()).unwrap();
    // VDI 2230 Part 1 (2015 tables, supplier worked example): M12 8.8 at
    // μ 0.14 → F_M = 41.9 kN.
    let fm = json["preload"]["max"]["value"].as_f64().unwrap();
    assert!((fm - 41_900.0).abs() / 41_900.0 < 0.005, "{fm}");
    assert!(text.contains(&format!("{:.2} kN", fm / 1000.0)), "{text}");
}

#[tokio::test]
async fn problems_are_listed_with_suggestions() {
    let e = run(&args(&["--finish", "zinc-plated", "--lubricant", "none"]))
        .await
        .unwrap_err();
    assert!(e.contains("finish: unknown finish 'zinc-plated'"), "{e}");
    assert!(e.contains("did you mean"), "{e}");
    let e = run(&args(&[])).await.unwrap_err();
    assert!(
        e.contains("(422)") && e.contains("finish") && e.contains("lubricant"),
        "{e}"
    );
}

/// The joint block in the table and in `--json`, from the flat flags.
#[tokio::test]
async fn the_joint_block_in_the_table_and_the_json() {
    let a = args(&[
        "--thread-friction",
        "0.12",
        "--bearing-friction",
        "0.12",
        "--clamped-parts",
        "3mm:steel-s235,20mm:aluminium-6082",
        "--joint-outer-diameter",
        "30mm",
        "--loads-axial",
        "6kN",
        "--loads-axial-min",
        "2kN",
    ]);
    let text = run(&a).await.unwrap();
    for line in [
        "Joint       δ_S",
        "Embedding   f_Z",
        "Working     F_SA",
        "Safety      yield",
    ] {
        assert!(text.contains(line), "{line}: {text}");
    }
    assert!(text.contains("(default)"), "{text}");
    let mut j = a.clone();
    j.json = true;
    let json: serde_json::Value = serde_json::from_str(&run(&j).await.unwrap()).unwrap();
    assert_eq!(json["joint"]["bolt_resilience"]["unit"], "mm/N");
    assert!(json["joint"]["safety"]["fatigue"].as_f64().is_some());
    assert_eq!(
        json["joint"]["defaults"],
        serde_json::json!(["load_introduction", "roughness_rz", "thread_rolling"])
    );
}
