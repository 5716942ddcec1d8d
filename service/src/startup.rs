//! Wiring: builds the application from configuration.
//!
//! [`Application::build`] opens the application context (`app::App`: the
//! store, migrations and seed, the live catalogue and its watcher), hands
//! it with the HTTP settings to one `AppState`, binds the listen address (port 0 picks a free
//! one, see [`Application::port`]) and [`Application::run_until_stopped`]
//! serves until SIGTERM/SIGINT, letting in-flight requests finish within
//! the configured shutdown timeout. [`app`] puts `crate::http::routes` (the
//! one place where every HTTP module registers its handlers) together with
//! the middleware and the fallback.

use std::net::TcpListener;
use std::sync::Arc;
use std::time::Duration;

use actix_web::body::MessageBody;
use actix_web::dev::{Server, ServiceFactory, ServiceRequest, ServiceResponse};
use actix_web::http::KeepAlive;
use actix_web::middleware::from_fn;
use actix_web::{web, App, HttpServer};
use utoipa_actix_web::AppExt;

use crate::config::Config;
use crate::http::error::ApiError;
use crate::http::metrics::Metrics;
use crate::http::state::{AppState, HttpSettings};
use crate::http::{accept, deadline, extract, metrics, openapi, request_id};

/// Why the service could not start.
#[derive(Debug, thiserror::Error)]
pub enum StartupError {
    #[error("cannot listen on {addr}: {source}")]
    Bind {
        addr: String,
        source: std::io::Error,
    },
    #[error("metrics: {0}")]
    Metrics(#[from] prometheus::Error),
    #[error("openapi document: {0}")]
    OpenApi(#[from] serde_json::Error),
    #[error("catalogue store: {0}")]
    Store(#[from] crate::app::AppError),
}

/// The application for one worker: routes, the page (`ui`), extractor error handlers,
/// middleware (request id outermost, then metrics, the `Accept` check and
/// the body-read and request deadlines) and the 404/405 fallback.
pub fn app(
    state: AppState,
) -> App<
    impl ServiceFactory<
        ServiceRequest,
        Config = (),
        Response = ServiceResponse<impl MessageBody>,
        Error = actix_web::Error,
        InitError = (),
    >,
> {
    let limit = state.settings.max_body_bytes;
    let page = crate::ui::UiState {
        app: state.app.clone(),
        settings: crate::ui::UiSettings {
            anonymous_reads: state.auth.anonymous_reads(),
            max_form_bytes: limit,
        },
    };
    let (app, _api) = App::new()
        .into_utoipa_app()
        .configure(crate::http::routes)
        .split_for_parts();
    app.app_data(web::Data::new(state))
        .app_data(extract::json_config(limit))
        .app_data(extract::query_config())
        .app_data(extract::path_config())
        .app_data(extract::payload_config(limit))
        .route("/openapi.json", web::get().to(openapi::serve))
        .configure(|cfg| crate::ui::configure(cfg, page))
        .default_service(web::to(not_found))
        .wrap(from_fn(deadline::middleware))
        .wrap(from_fn(accept::middleware))
        .wrap(from_fn(metrics::middleware))
        .wrap(from_fn(request_id::middleware))
}

/// The fallback: a browser asking for `/` is sent to the page
/// (`http::root`), 405 with `Allow` for a known path asked with another
/// method, 404 for an unknown path.
async fn not_found(req: actix_web::HttpRequest) -> Result<actix_web::HttpResponse, ApiError> {
    if let Some(redirect) = crate::http::root::browser_redirect(&req) {
        return Ok(redirect);
    }
    if let Some(allowed) = crate::http::routes_table::allowed_methods(req.path()) {
        return Err(ApiError::MethodNotAllowed {
            method: req.method().to_string(),
            allowed,
        });
    }
    Err(ApiError::not_found(format!(
        "no resource at {} {}; see /openapi.json for the routes",
        req.method(),
        req.path()
    )))
}

/// A listening socket on `addr` (`host:port`; the first address that
/// binds) with a listen backlog of `backlog` pending connections (the
/// standard library's `TcpListener::bind` has a fixed one).
fn bind(addr: &str, backlog: u32) -> std::io::Result<TcpListener> {
    use socket2::{Domain, Protocol, Socket, Type};
    use std::net::ToSocketAddrs;
    let mut last = None;
    for a in addr.to_socket_addrs()? {
        let socket = Socket::new(Domain::for_address(a), Type::STREAM, Some(Protocol::TCP))?;
        // As the standard library does on Unix: rebinding right after a restart works.
        #[cfg(unix)]
        socket.set_reuse_address(true)?;
        let bound = socket
            .bind(&a.into())
            .and_then(|()| socket.listen(i32::try_from(backlog).unwrap_or(i32::MAX)));
        match bound {
            Ok(()) => return Ok(socket.into()),
            Err(e) => last = Some(e),
        }
    }
    Err(last.unwrap_or_else(|| {
        std::io::Error::new(std::io::ErrorKind::InvalidInput, "no address to listen on")
    }))
}

/// A bound, not yet running service.
pub struct Application {
    port: u16,
    server: Server,
    state: AppState,
    watcher: Option<tokio::task::JoinHandle<()>>,
    deliverer: Option<tokio::task::JoinHandle<()>>,
    mqtt: Option<tokio::task::JoinHandle<()>>,
}

impl Application {
    /// Opens the catalogue store (`config.database_url`, default embedded
    /// SQLite; migrations and seed applied), starts the watcher that keeps
    /// the in-memory catalogue current, binds `config.listen` and prepares
    /// the server.
    pub async fn build(config: Config) -> Result<Self, StartupError> {
        let context = crate::app::App::open(config.database_url.as_deref())
            .await?
            .with_four_eyes(config.four_eyes);
        let metrics = Metrics::new()?;
        let openapi_json: Arc<str> = openapi::document_json()?.into();
        let settings = HttpSettings {
            max_body_bytes: config.max_body_bytes,
            body_read_timeout_secs: config.limits.body_read_timeout_secs,
            request_timeout_secs: config.limits.request_timeout_secs,
            answer_cache_entries: config.answer_cache_entries,
        };
        let deliverer = if config.webhooks.delivery {
            Some(context.deliverer(delivery_settings(&config.webhooks))?)
        } else {
            None
        };
        let publisher = config
            .mqtt
            .broker
            .as_ref()
            .map(|b| context.mqtt_publisher(mqtt_settings(b, &config.mqtt.topic_prefix)));
        let watcher = context.watch();
        let state = AppState::new(
            settings,
            metrics,
            openapi_json,
            context,
            config.anonymous_reads,
        );
        match Self::serve(&config, state) {
            Ok(mut app) => {
                app.watcher = Some(watcher);
                // off the request path: its own task, its own HTTP client
                app.deliverer = deliverer.map(crate::app::delivery::Deliverer::spawn);
                // its own task too: a broker that is down never holds a request
                app.mqtt = publisher.map(crate::app::mqtt::Publisher::spawn);
                Ok(app)
            }
            Err(e) => {
                watcher.abort();
                Err(e)
            }
        }
    }

    /// Binds `config.listen` and prepares the server over `state`.
    fn serve(config: &Config, state: AppState) -> Result<Self, StartupError> {
        let listener =
            bind(&config.listen, config.limits.backlog).map_err(|source| StartupError::Bind {
                addr: config.listen.clone(),
                source,
            })?;
        let port = listener
            .local_addr()
            .map_err(|source| StartupError::Bind {
                addr: config.listen.clone(),
                source,
            })?
            .port();
        let factory_state = state.clone();
        // TCP_NODELAY: a streamed answer ends with a small final chunk,
        // which Nagle's algorithm would hold back until the client's
        // delayed ACK (tens of milliseconds on a 6 MB batch answer).
        let limits = &config.limits;
        let workers = if config.workers > 0 {
            config.workers
        } else {
            // actix-web's own default: one worker per available core.
            std::thread::available_parallelism().map_or(1, |n| n.get())
        };
        let keep_alive = match limits.keep_alive_secs {
            0 => KeepAlive::Disabled,
            s => KeepAlive::Timeout(Duration::from_secs(s)),
        };
        let server = HttpServer::new(move || app(factory_state.clone()))
            .tcp_nodelay(true)
            .workers(workers)
            .max_connections(limits.per_worker(workers))
            .keep_alive(keep_alive)
            .client_request_timeout(Duration::from_secs(limits.header_read_timeout_secs))
            .client_disconnect_timeout(Duration::from_millis(limits.disconnect_timeout_ms))
            .shutdown_timeout(config.shutdown_timeout_secs);
        let server = server
            .listen(listener)
            .map_err(|source| StartupError::Bind {
                addr: config.listen.clone(),
                source,
            })?
            .run();
        tracing::info!(port, "listening");
        Ok(Self {
            port,
            server,
            state,
            watcher: None,
            deliverer: None,
            mqtt: None,
        })
    }

    /// The port actually bound.
    pub fn port(&self) -> u16 {
        self.port
    }

    /// The shared state (application context, metrics, settings).
    pub fn state(&self) -> &AppState {
        &self.state
    }

    /// A handle to stop the server (tests stop instances with it).
    pub fn server_handle(&self) -> actix_web::dev::ServerHandle {
        self.server.handle()
    }

    /// Serves until SIGTERM/SIGINT (actix handles both signals and stops
    /// gracefully), then stops the catalogue watcher, the webhook
    /// worker (an attempt cut short is claimed again after its lease) and
    /// the MQTT publisher.
    pub async fn run_until_stopped(self) -> std::io::Result<()> {
        let result = self.server.await;
        for task in [self.watcher, self.deliverer, self.mqtt]
            .into_iter()
            .flatten()
        {
            task.abort();
        }
        result
    }
}

/// The application's delivery settings from the server's.
fn delivery_settings(w: &crate::config::Webhooks) -> crate::app::delivery::DeliverySettings {
    crate::app::delivery::DeliverySettings {
        interval: Duration::from_millis(w.interval_ms.max(1)),
        timeout: Duration::from_secs(w.timeout_secs.max(1)),
        concurrency: usize::try_from(w.concurrency).unwrap_or(16).max(1),
    }
}

/// The application's MQTT settings from the server's.
fn mqtt_settings(b: &crate::config::Broker, prefix: &str) -> crate::app::mqtt::MqttSettings {
    crate::app::mqtt::MqttSettings {
        host: b.host.clone(),
        port: b.port,
        topic_prefix: prefix.to_string(),
    }
}

/// Logging: human-readable by default, JSON lines with
/// `TIGHTSPEC_LOG_FORMAT=json`; filter by `RUST_LOG` (default `info`).
/// Safe to call more than once (later calls do nothing).
pub fn init_logging() {
    init_logging_with(
        tracing_subscriber::EnvFilter::try_from_default_env().unwrap_or_else(|_| "info".into()),
    );
}

/// Logging with an explicit filter (tests pass their own).
pub fn init_logging_with(filter: tracing_subscriber::EnvFilter) {
    let json = std::env::var("TIGHTSPEC_LOG_FORMAT").is_ok_and(|v| v.eq_ignore_ascii_case("json"));
    let builder = tracing_subscriber::fmt().with_env_filter(filter);
    let _ = if json {
        builder.json().with_current_span(true).try_init()
    } else {
        builder.try_init()
    };
}

/// The OpenAPI document of every registered route, as `GET /openapi.json`
/// serves it (for `tightspec openapi`, which may not use `http` itself).
pub fn openapi_document() -> Result<String, serde_json::Error> {
    crate::http::openapi::document_json()
}
