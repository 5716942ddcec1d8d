//! Prometheus metrics: requests by route pattern, method and status,
//! latency histogram, and the catalogue revision being served.

use std::time::Instant;

use actix_web::body::MessageBody;
use actix_web::dev::{ServiceRequest, ServiceResponse};
use actix_web::middleware::Next;
use actix_web::web;
use prometheus::{
    Encoder, HistogramOpts, HistogramVec, IntCounter, IntCounterVec, IntGauge, Opts, Registry,
    TextEncoder,
};

use super::state::AppState;

/// Route label for requests that matched no route (keeps label
/// cardinality bounded whatever paths clients send).
pub const UNMATCHED: &str = "<unmatched>";

/// The service's metrics, registered in their own registry.
#[derive(Clone)]
pub struct Metrics {
    registry: Registry,
    requests_total: IntCounterVec,
    request_duration: HistogramVec,
    catalogue_revision: IntGauge,
    /// Answer-cache look-ups, resolved once per route and result
    /// (`[spec hit, spec miss, setpoints hit, setpoints miss]`) so that
    /// counting one costs no label hashing.
    answer_cache: [IntCounter; 4],
}

/// The routes whose GET answers are cached (`answer_cache` label `route`).
#[derive(Debug, Clone, Copy)]
pub enum CachedRoute {
    Spec,
    Setpoints,
}

impl CachedRoute {
    /// The route's path, the `route` label.
    pub fn path(self) -> &'static str {
        match self {
            CachedRoute::Spec => "/v1/tightening-specs",
            CachedRoute::Setpoints => "/v1/setpoints",
        }
    }
}

impl Metrics {
    pub fn new() -> Result<Self, prometheus::Error> {
        let registry = Registry::new();
        let requests_total = IntCounterVec::new(
            Opts::new("http_requests_total", "HTTP requests served"),
            &["route", "method", "status"],
        )?;
        // Buckets from 100 µs to 5 s: look-ups are sub-millisecond, batches longer.
        let request_duration = HistogramVec::new(
            HistogramOpts::new(
                "http_request_duration_seconds",
                "Time to serve an HTTP request",
            )
            .buckets(vec![
                0.0001, 0.00025, 0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5,
                1.0, 2.5, 5.0,
            ]),
            &["route", "method"],
        )?;
        let catalogue_revision = IntGauge::new(
            "tightspec_catalogue_revision",
            "Friction catalogue revision currently served",
        )?;
        registry.register(Box::new(requests_total.clone()))?;
        registry.register(Box::new(request_duration.clone()))?;
        let answer_cache = IntCounterVec::new(
            Opts::new(
                "tightspec_answer_cache_lookups_total",
                "GET look-ups by whether a kept answer was served (hit) or computed (miss)",
            ),
            &["route", "result"],
        )?;
        registry.register(Box::new(catalogue_revision.clone()))?;
        registry.register(Box::new(answer_cache.clone()))?;
        let counter = |route: &str, result: &str| answer_cache.with_label_values(&[route, result]);
        let answer_cache = [
            counter(CachedRoute::Spec.path(), "hit"),
            counter(CachedRoute::Spec.path(), "miss"),
            counter(CachedRoute::Setpoints.path(), "hit"),
            counter(CachedRoute::Setpoints.path(), "miss"),
        ];
        Ok(Self {
            registry,
            requests_total,
            request_duration,
            catalogue_revision,
            answer_cache,
        })
    }

    /// Record the catalogue revision now served.
    pub fn set_catalogue_revision(&self, revision: i64) {
        self.catalogue_revision.set(revision);
    }

    /// Count one look-up of the answer cache.
    pub fn answer_cache_lookup(&self, route: CachedRoute, hit: bool) {
        let row = match route {
            CachedRoute::Spec => 0,
            CachedRoute::Setpoints => 2,
        };
        self.answer_cache[row + usize::from(!hit)].inc();
    }

    fn observe(&self, route: &str, method: &str, status: u16, seconds: f64) {
        self.requests_total
            .with_label_values(&[route, method, &status.to_string()])
            .inc();
        self.request_duration
            .with_label_values(&[route, method])
            .observe(seconds);
    }

    /// Prometheus text exposition format.
    pub fn render(&self) -> Result<String, String> {
        let mut buf = Vec::new();
        TextEncoder::new()
            .encode(&self.registry.gather(), &mut buf)
            .map_err(|e| e.to_string())?;
        String::from_utf8(buf).map_err(|e| e.to_string())
    }
}

/// Middleware: count and time every request by its route pattern.
pub async fn middleware(
    req: ServiceRequest,
    next: Next<impl MessageBody + 'static>,
) -> Result<ServiceResponse<impl MessageBody>, actix_web::Error> {
    let started = Instant::now();
    let metrics = req
        .app_data::<web::Data<AppState>>()
        .map(|s| s.metrics.clone());
    let method = req.method().as_str().to_owned();
    let res = next.call(req).await;
    if let Some(metrics) = metrics {
        let (route, status) = match &res {
            Ok(res) => (
                res.request()
                    .match_pattern()
                    .unwrap_or_else(|| UNMATCHED.to_owned()),
                res.status().as_u16(),
            ),
            Err(e) => (
                UNMATCHED.to_owned(),
                e.as_response_error().status_code().as_u16(),
            ),
        };
        metrics.observe(&route, &method, status, started.elapsed().as_secs_f64());
    }
    res
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn renders_the_three_families() {
        let m = Metrics::new().expect("metrics register");
        m.observe("/v1/threads/{designation}", "GET", 200, 0.001);
        m.set_catalogue_revision(3);
        let text = m.render().expect("renders");
        assert!(text.contains(
            r#"http_requests_total{method="GET",route="/v1/threads/{designation}",status="200"} 1"#
        ));
        assert!(text.contains("http_request_duration_seconds_bucket"));
        assert!(text.contains("tightspec_catalogue_revision 3"));
        m.answer_cache_lookup(CachedRoute::Setpoints, true);
        let text = m.render().expect("renders");
        assert!(text.contains(
            r#"tightspec_answer_cache_lookups_total{result="hit",route="/v1/setpoints"} 1"#
        ));
    }
}
