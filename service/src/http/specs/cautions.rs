//! The cautions a spec or setpoint response carries: the engine's list
//! (`Spec::cautions`), all of it for a spec, the first two for setpoints.
//! The engine's standard list is the same on every response, so its JSON is
//! written once per process and copied into each response instead of being
//! escaped again each time; any other list is written as usual.

use std::sync::LazyLock;

use serde::{Serialize, Serializer};
use serde_json::value::RawValue;

use crate::engine::spec::CAUTIONS;

/// How many of the engine's cautions the setpoint answer repeats (the
/// estimate-and-test caution and the precedence of drawings and codes).
const SHORT_LEN: usize = 2;

/// The cautions of one response.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Cautions(&'static [&'static str]);

/// The standard lists with their JSON, written once.
static RENDERED: LazyLock<[(Cautions, Option<Box<RawValue>>); 2]> = LazyLock::new(|| {
    let standard = [Cautions::all(&CAUTIONS), Cautions::short(&CAUTIONS)];
    standard.map(|c| (c, render(c)))
});

fn render(c: Cautions) -> Option<Box<RawValue>> {
    let json = serde_json::to_string(c.texts()).ok()?;
    RawValue::from_string(json).ok()
}

impl Cautions {
    /// Every caution of a spec.
    pub fn all(texts: &'static [&'static str]) -> Self {
        Self(texts)
    }

    /// The cautions a setpoint answer repeats: the first two.
    pub fn short(texts: &'static [&'static str]) -> Self {
        Self(&texts[..texts.len().min(SHORT_LEN)])
    }

    /// The texts, in order.
    pub fn texts(self) -> &'static [&'static str] {
        self.0
    }

    /// The JSON written once, when this is one of the standard lists.
    /// Compared by content: `CAUTIONS` is a `const`, so two uses need not
    /// share an address.
    fn rendered(self) -> Option<&'static RawValue> {
        RENDERED
            .iter()
            .find(|(c, _)| c.0 == self.0)
            .and_then(|(_, raw)| raw.as_deref())
    }
}

impl Serialize for Cautions {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        match self.rendered() {
            Some(raw) => raw.serialize(s),
            None => self.texts().serialize(s),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn written_as_the_plain_list_would_be() {
        for which in [Cautions::all(&CAUTIONS), Cautions::short(&CAUTIONS)] {
            assert!(which.rendered().is_some(), "standard list written once");
            let raw = serde_json::to_string(&which).unwrap();
            let plain = serde_json::to_string(which.texts()).unwrap();
            assert_eq!(raw, plain);
            // Also inside another value (the raw path is taken there too).
            let nested = serde_json::to_value(serde_json::json!({ "c": which })).unwrap();
            assert_eq!(
                nested["c"].as_array().map(Vec::len),
                Some(which.texts().len())
            );
        }
        assert_eq!(Cautions::short(&CAUTIONS).texts().len(), 2);
        assert!(Cautions::all(&CAUTIONS).texts()[0].contains("ISO 16047"));
    }

    #[test]
    fn another_list_is_written_as_it_is() {
        static OTHER: [&str; 3] = ["first \"quoted\"", "second", "third"];
        let c = Cautions::all(&OTHER);
        assert!(c.rendered().is_none());
        assert_eq!(
            serde_json::to_string(&c).unwrap(),
            r#"["first \"quoted\"","second","third"]"#
        );
        assert_eq!(Cautions::short(&OTHER).texts(), &OTHER[..2]);
    }
}
