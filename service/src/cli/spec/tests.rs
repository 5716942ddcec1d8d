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
