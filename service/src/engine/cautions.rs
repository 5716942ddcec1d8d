//! The cautions an answer carries: the ones every answer needs, and the
//! ones that apply only when the answer contains an angle window or
//! tightens the bolt into the plastic range. The wording is this service's
//! own.

/// One caution.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Caution {
    /// Engineering estimate; confirm by joint test and tool capability.
    Estimate,
    /// Drawing, local codes and licensed engineering practice come first.
    Precedence,
    /// Safety-critical joints need the responsible engineer's sign-off.
    SafetyCritical,
    /// Embedding, temperature and external loads are not deducted.
    PreloadLosses,
    /// Angle figures come from the elastic resilience model.
    ElasticModel,
    /// A bolt tightened into the plastic range is not re-used.
    NoReuse,
}

impl Caution {
    /// Every caution, in the order an answer lists them.
    pub const ALL: [Caution; 6] = [
        Caution::Estimate,
        Caution::Precedence,
        Caution::SafetyCritical,
        Caution::PreloadLosses,
        Caution::ElasticModel,
        Caution::NoReuse,
    ];

    /// The sentence.
    pub fn text(self) -> &'static str {
        match self {
            Caution::Estimate => {
                "These values are engineering estimates from published methods (VDI 2230 Part 1) \
                 and the friction data stated; confirm them by joint tests on the real parts \
                 (torque-tension tests per ISO 16047) and by a capability study of the tool."
            }
            Caution::Precedence => {
                "The drawing, local codes and licensed engineering practice take precedence \
                 over this specification."
            }
            Caution::SafetyCritical => {
                "Where the joint is safety-critical (lifting equipment, pressure equipment, \
                 structures, steering or brakes), these values may be used only after the \
                 responsible engineer has checked and signed them off under the codes that \
                 apply to that equipment."
            }
            Caution::PreloadLosses => {
                "Preload losses from embedding, temperature and external loads are not \
                 deducted; the preload range is the assembly preload."
            }
            Caution::ElasticModel => {
                "Torque-angle figures use the elastic VDI 2230 resilience model; tightening \
                 into the plastic range needs angle values established by test."
            }
            Caution::NoReuse => {
                "This tightening can take the bolt past its yield point into the plastic \
                 range: a bolt tightened that way must not be tightened again or re-used; \
                 fit a new one."
            }
        }
    }

    fn bit(self) -> u8 {
        1 << (self as u8)
    }
}

/// The cautions that apply to one answer (a small set, copied freely).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct CautionSet(u8);

/// The cautions every answer carries.
const BASE: [Caution; 4] = [
    Caution::Estimate,
    Caution::Precedence,
    Caution::SafetyCritical,
    Caution::PreloadLosses,
];

impl CautionSet {
    /// The cautions every answer carries.
    pub fn base() -> Self {
        Self(BASE.iter().fold(0, |bits, c| bits | c.bit()))
    }

    /// The set of a spec: the base, the elastic-model caution when an
    /// angle window is given, the no-re-use caution when the bolt may be
    /// tightened into the plastic range.
    pub fn for_spec(angle_given: bool, into_plastic_range: bool) -> Self {
        let mut set = Self::base();
        if angle_given {
            set = set.with(Caution::ElasticModel);
        }
        if into_plastic_range {
            set = set.with(Caution::NoReuse);
        }
        set
    }

    /// This set and one more.
    pub fn with(self, c: Caution) -> Self {
        Self(self.0 | c.bit())
    }

    /// This set without one.
    pub fn without(self, c: Caution) -> Self {
        Self(self.0 & !c.bit())
    }

    pub fn contains(self, c: Caution) -> bool {
        self.0 & c.bit() != 0
    }

    /// The cautions in order.
    pub fn iter(self) -> impl Iterator<Item = Caution> {
        Caution::ALL.into_iter().filter(move |c| self.contains(*c))
    }

    /// The sentences in order.
    pub fn texts(self) -> impl Iterator<Item = &'static str> {
        self.iter().map(Caution::text)
    }

    pub fn len(self) -> usize {
        self.0.count_ones() as usize
    }

    pub fn is_empty(self) -> bool {
        self.0 == 0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sets_follow_the_answer() {
        let plain = CautionSet::for_spec(false, false);
        assert_eq!(plain, CautionSet::base());
        assert_eq!(plain.len(), 4);
        assert!(plain.texts().next().unwrap().contains("ISO 16047"));
        assert!(plain
            .texts()
            .any(|t| t.contains("licensed engineering practice")));
        assert!(plain.texts().any(|t| t.contains("signed them off")));
        assert!(!plain.contains(Caution::ElasticModel));
        let angle = CautionSet::for_spec(true, false);
        assert!(angle.contains(Caution::ElasticModel) && !angle.contains(Caution::NoReuse));
        let plastic = CautionSet::for_spec(true, true);
        assert_eq!(plastic.len(), 6);
        assert_eq!(plastic.iter().last(), Some(Caution::NoReuse));
        let texts: Vec<_> = plastic.texts().collect();
        assert!(texts[5].contains("re-used"));
        assert_eq!(
            plastic.without(Caution::ElasticModel),
            CautionSet::for_spec(false, true)
        );
    }
}
