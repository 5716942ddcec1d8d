//! The revision detail has one `changes` key (the list) and the count as
//! `change_count`; the raw body is checked, since a JSON parser keeps only
//! one of two equal keys. Body and OpenAPI schema agree.

use std::collections::HashSet;

use serde_json::Value;

use crate::support::TestApp;

/// Every object in `text` (raw JSON) has unique keys; panics naming the
/// first repeated one. Reads with serde_json's streaming map visitor, which
/// sees each key as written.
fn assert_unique_keys(text: &str) {
    struct Checked;
    impl<'de> serde::Deserialize<'de> for Checked {
        fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
            d.deserialize_any(Visitor)
        }
    }
    struct Visitor;
    impl<'de> serde::de::Visitor<'de> for Visitor {
        type Value = Checked;
        fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
            f.write_str("JSON")
        }
        fn visit_map<A: serde::de::MapAccess<'de>>(self, mut m: A) -> Result<Checked, A::Error> {
            let mut seen = HashSet::new();
            while let Some(key) = m.next_key::<String>()? {
                if !seen.insert(key.clone()) {
                    return Err(serde::de::Error::custom(format!("duplicate key `{key}`")));
                }
                m.next_value::<Checked>()?;
            }
            Ok(Checked)
        }
        fn visit_seq<A: serde::de::SeqAccess<'de>>(self, mut s: A) -> Result<Checked, A::Error> {
            while s.next_element::<Checked>()?.is_some() {}
            Ok(Checked)
        }
        fn visit_bool<E>(self, _: bool) -> Result<Checked, E> {
            Ok(Checked)
        }
        fn visit_i64<E>(self, _: i64) -> Result<Checked, E> {
            Ok(Checked)
        }
        fn visit_u64<E>(self, _: u64) -> Result<Checked, E> {
            Ok(Checked)
        }
        fn visit_f64<E>(self, _: f64) -> Result<Checked, E> {
            Ok(Checked)
        }
        fn visit_str<E>(self, _: &str) -> Result<Checked, E> {
            Ok(Checked)
        }
        fn visit_unit<E>(self) -> Result<Checked, E> {
            Ok(Checked)
        }
    }
    if let Err(e) = serde_json::from_str::<Checked>(text) {
        panic!("{e}: {text:.300}");
    }
}

#[test]
fn the_key_check_finds_a_repeated_key() {
    assert_unique_keys(r#"{"a":1,"b":{"c":[1,{"d":2}]}}"#);
    let repeated =
        std::panic::catch_unwind(|| assert_unique_keys(r#"{"a":1,"b":[{"c":1,"c":[]}]}"#));
    assert!(repeated.is_err());
}

#[tokio::test]
async fn revision_detail_has_one_changes_key_and_a_change_count() {
    let app = TestApp::spawn().await;
    let list = app.get_json("/v1/catalogue/revisions").await;
    let newest = &list["revisions"][0];
    let n = newest["revision"].as_i64().expect("a revision");
    assert!(newest["change_count"].as_i64().unwrap_or(0) > 0, "{newest}");
    assert!(newest.get("changes").is_none(), "{newest}");

    let r = app.get(&format!("/v1/catalogue/revisions/{n}")).await;
    assert_eq!(r.status(), 200);
    let text = r.text().await.unwrap();
    assert_unique_keys(&text);
    let detail: Value = serde_json::from_str(&text).unwrap();
    let changes = detail["changes"].as_array().expect("changes is the list");
    assert_eq!(detail["change_count"].as_u64(), Some(changes.len() as u64));

    // The schema names the same keys the body has.
    let doc = app.get_json("/openapi.json").await;
    let schema = &doc["components"]["schemas"]["RevisionDetail"];
    let mut documented: Vec<String> = Vec::new();
    collect_properties(&doc, schema, &mut documented);
    for key in detail.as_object().unwrap().keys() {
        assert!(
            documented.contains(key),
            "{key} not in the schema: {documented:?}"
        );
    }
    assert!(documented.contains(&"change_count".to_string()));
}

/// Property names of a schema, following `$ref` and `allOf`.
fn collect_properties(doc: &Value, schema: &Value, out: &mut Vec<String>) {
    if let Some(r) = schema["$ref"].as_str() {
        let name = r.rsplit('/').next().unwrap_or("");
        return collect_properties(doc, &doc["components"]["schemas"][name], out);
    }
    if let Some(props) = schema["properties"].as_object() {
        out.extend(props.keys().cloned());
    }
    for part in schema["allOf"].as_array().into_iter().flatten() {
        collect_properties(doc, part, out);
    }
}
