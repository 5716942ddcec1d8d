//! The retry schedule of a webhook delivery: exponential back-off, 30 s
//! after the first failed attempt and doubling, at most 6 h between
//! attempts, given up after the 14th attempt, which comes about 26.5 h
//! after the first (so a target is tried for more than 24 h). Doubling from
//! a short first delay with a cap is common practice for retries; the
//! figures are this service's choice.

use chrono::{DateTime, Duration, Utc};

/// Seconds between the first and the second attempt.
const FIRST_DELAY_SECS: i64 = 30;

/// Longest wait between two attempts (6 h).
const MAX_DELAY_SECS: i64 = 6 * 3600;

/// Attempts made before a delivery is given up (marked failed).
pub const MAX_ATTEMPTS: i64 = 14;

/// The wait after failed attempt number `attempt` (1-based): 30 s × 2^(n−1),
/// at most 6 h.
pub fn delay_after(attempt: i64) -> Duration {
    let doublings = attempt.clamp(1, 32) - 1;
    let secs = FIRST_DELAY_SECS.saturating_mul(1_i64 << doublings);
    Duration::seconds(secs.min(MAX_DELAY_SECS))
}

/// When a delivery whose attempt number `attempt` failed at `at` is tried
/// again, or `None` when that was the last attempt.
pub fn next_attempt(attempt: i64, at: DateTime<Utc>) -> Option<DateTime<Utc>> {
    (attempt < MAX_ATTEMPTS).then(|| at + delay_after(attempt))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_delay_doubles_up_to_six_hours() {
        let secs: Vec<i64> = (1..=12).map(|n| delay_after(n).num_seconds()).collect();
        assert_eq!(
            secs,
            [30, 60, 120, 240, 480, 960, 1920, 3840, 7680, 15360, 21600, 21600]
        );
        assert_eq!(delay_after(1000).num_seconds(), MAX_DELAY_SECS);
    }

    #[test]
    fn a_delivery_is_tried_for_more_than_24_hours_then_given_up() {
        let t0 = DateTime::parse_from_rfc3339("2026-12-03T10:00:00Z")
            .unwrap()
            .with_timezone(&Utc);
        let mut at = t0;
        let mut attempts = 1;
        while let Some(next) = next_attempt(attempts, at) {
            at = next;
            attempts += 1;
        }
        assert_eq!(attempts, MAX_ATTEMPTS);
        let span = at - t0;
        assert!(span >= Duration::hours(24), "tried for {span}");
        // 30 s × (2^10 − 1) + 3 × 6 h = 95,490 s
        assert_eq!(span.num_seconds(), 95_490);
    }
}
