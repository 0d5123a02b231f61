//! Real-browser harness: a static file server for the built `dist/` folder, a
//! chromedriver process on a free port, and a headless Chromium session with the
//! flags this machine needs. Every session is closed even when the test body fails.

use crate::static_files;
use fantoccini::{Client, ClientBuilder, Locator};
use hyper_util::client::legacy::connect::HttpConnector;
use std::future::Future;
use std::net::TcpListener;
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::sync::Arc;
use std::time::{Duration, Instant};

/// Headless Chromium flags required here (closed network, root user, no GPU).
pub const CHROMIUM_FLAGS: &[&str] = &[
    "--headless=new",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--disable-dev-shm-usage",
];

/// The dist folder under test: `BANDGAUGE_DIST`, else `<workspace>/dist`.
pub fn dist_dir() -> PathBuf {
    std::env::var_os("BANDGAUGE_DIST")
        .map(PathBuf::from)
        .unwrap_or_else(|| {
            Path::new(env!("CARGO_MANIFEST_DIR"))
                .parent()
                .expect("tests/ has a parent")
                .join("dist")
        })
}

fn free_port() -> u16 {
    TcpListener::bind("127.0.0.1:0")
        .and_then(|l| l.local_addr())
        .map(|a| a.port())
        .expect("a free loopback port")
}

/// A static file server on 127.0.0.1 serving one folder; stops when dropped.
pub struct StaticServer {
    server: Arc<tiny_http::Server>,
    thread: Option<std::thread::JoinHandle<()>>,
    /// The base URL, ending in `/`.
    pub url: String,
    /// Every path requested so far (for tests that check the page fetches nothing else).
    pub requests: Arc<std::sync::Mutex<Vec<String>>>,
}

impl StaticServer {
    /// Serves `root` on a free loopback port. The socket is bound to port 0 and kept,
    /// so no other test can take the port between choosing and binding it.
    pub fn start(root: &Path) -> StaticServer {
        let server = Arc::new(tiny_http::Server::http("127.0.0.1:0").expect("bind static server"));
        let port = server
            .server_addr()
            .to_ip()
            .expect("a TCP listening address")
            .port();
        let requests = Arc::new(std::sync::Mutex::new(Vec::new()));
        let (srv, root, log) = (server.clone(), root.to_path_buf(), requests.clone());
        let thread = std::thread::spawn(move || {
            for request in srv.incoming_requests() {
                let raw = static_files::request_path(request.url()).to_string();
                log.lock().expect("request log").push(raw.clone());
                let response = static_files::response(&root, &raw);
                let _ = request.respond(response);
            }
        });
        StaticServer {
            server,
            thread: Some(thread),
            url: format!("http://127.0.0.1:{port}/"),
            requests,
        }
    }
}

impl Drop for StaticServer {
    fn drop(&mut self) {
        self.server.unblock();
        if let Some(t) = self.thread.take() {
            let _ = t.join();
        }
    }
}

/// A chromedriver process; killed when dropped.
struct Driver {
    child: Child,
    port: u16,
}

impl Driver {
    /// Starts chromedriver on a free port. Chromedriver must pick up the port after we
    /// release it, so another process can win the race: then chromedriver exits and we
    /// try again on a new port (up to five times).
    fn start() -> Driver {
        let binary =
            std::env::var("CHROMEDRIVER").unwrap_or_else(|_| "/usr/bin/chromedriver".into());
        for _attempt in 0..5 {
            let port = free_port();
            let mut child = Command::new(&binary)
                .arg(format!("--port={port}"))
                .stdout(Stdio::null())
                .stderr(Stdio::null())
                .spawn()
                .unwrap_or_else(|e| {
                    panic!("cannot start {binary}: {e} (cargo xtask test installs it)")
                });
            let deadline = Instant::now() + Duration::from_secs(20);
            loop {
                if let Ok(Some(_)) = child.try_wait() {
                    break; // exited: most likely the port was taken; retry
                }
                if driver_answers(port) {
                    return Driver { child, port };
                }
                assert!(
                    Instant::now() < deadline,
                    "chromedriver did not listen on port {port}"
                );
                std::thread::sleep(Duration::from_millis(50));
            }
        }
        panic!("chromedriver could not start on any of five free ports");
    }
}

/// True when a WebDriver server (not some other listener) answers `GET /status` on `port`.
fn driver_answers(port: u16) -> bool {
    use std::io::{Read, Write};
    let Ok(mut stream) = std::net::TcpStream::connect(("127.0.0.1", port)) else {
        return false;
    };
    let _ = stream.set_read_timeout(Some(Duration::from_secs(2)));
    let request =
        format!("GET /status HTTP/1.1\r\nHost: 127.0.0.1:{port}\r\nConnection: close\r\n\r\n");
    if stream.write_all(request.as_bytes()).is_err() {
        return false;
    }
    let mut reply = String::new();
    let _ = stream.read_to_string(&mut reply);
    reply.contains("\"ready\"")
}

impl Drop for Driver {
    fn drop(&mut self) {
        let _ = self.child.kill();
        let _ = self.child.wait();
    }
}

/// Runs `body` with a fresh headless Chromium session whose window is `width` x `height`,
/// pointed at nothing yet; `base` is the static server's URL for `dist_dir()`.
/// The session is always closed; a failure in `body` is re-raised afterwards.
pub async fn with_browser<F, Fut>(width: u32, height: u32, body: F)
where
    F: FnOnce(Client, String) -> Fut + Send + 'static,
    Fut: Future<Output = ()> + Send + 'static,
{
    let dist = dist_dir();
    assert!(
        dist.join("index.html").exists(),
        "no built app at {} (run cargo xtask test)",
        dist.display()
    );
    let server = StaticServer::start(&dist);
    with_browser_at(width, height, server.url.clone(), body).await;
    drop(server);
}

/// Like [`with_browser`] but with a caller-chosen base URL (for tests that run their own server).
pub async fn with_browser_at<F, Fut>(width: u32, height: u32, base: String, body: F)
where
    F: FnOnce(Client, String) -> Fut + Send + 'static,
    Fut: Future<Output = ()> + Send + 'static,
{
    let driver = Driver::start();
    let profile = std::env::temp_dir().join(format!(
        "bandgauge-chromium-{}-{}",
        std::process::id(),
        driver.port
    ));
    let mut args: Vec<String> = CHROMIUM_FLAGS.iter().map(|s| s.to_string()).collect();
    args.push(format!("--user-data-dir={}", profile.display()));
    args.push(format!("--window-size={width},{height}"));
    let mut caps = serde_json::Map::new();
    caps.insert(
        "goog:chromeOptions".into(),
        serde_json::json!({ "binary": "/usr/bin/chromium", "args": args }),
    );
    let client = ClientBuilder::new(HttpConnector::new())
        .capabilities(caps)
        .connect(&format!("http://127.0.0.1:{}", driver.port))
        .await
        .expect("a WebDriver session with headless Chromium");
    let outcome = tokio::spawn(body(client.clone(), base)).await;
    let _ = client.close().await;
    drop(driver);
    let _ = std::fs::remove_dir_all(&profile);
    if let Err(e) = outcome {
        if e.is_panic() {
            std::panic::resume_unwind(e.into_panic());
        }
        panic!("browser test task failed: {e}");
    }
}

/// Waits until the element with `data-testid` exists and returns it.
pub async fn by_testid(client: &Client, id: &str) -> fantoccini::elements::Element {
    let css = format!("[data-testid=\"{id}\"]");
    client
        .wait()
        .at_most(Duration::from_secs(20))
        .for_element(Locator::Css(&css))
        .await
        .unwrap_or_else(|e| panic!("element [data-testid={id}] did not appear: {e}"))
}

/// Replaces the content of an input as a user would: select all, then type.
pub async fn retype(client: &Client, id: &str, text: &str) {
    let input = by_testid(client, id).await;
    input.clear().await.expect("clear input");
    input.send_keys(text).await.expect("type into input");
}

/// Polls the text of `[data-testid=id]` until `accept` holds or 10 s pass; returns the last text.
pub async fn text_until(client: &Client, id: &str, accept: impl Fn(&str) -> bool) -> String {
    let deadline = Instant::now() + Duration::from_secs(10);
    loop {
        let text = by_testid(client, id).await.text().await.unwrap_or_default();
        if accept(&text) || Instant::now() > deadline {
            return text;
        }
        tokio::time::sleep(Duration::from_millis(50)).await;
    }
}

/// Saves a PNG screenshot under `tests/artifacts/` for a person to look at.
pub async fn screenshot(client: &Client, name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("artifacts");
    std::fs::create_dir_all(&dir).expect("create tests/artifacts");
    let png = client.screenshot().await.expect("screenshot");
    let path = dir.join(format!("{name}.png"));
    std::fs::write(&path, png).expect("write screenshot");
    path
}

/// A static file server that answers one request per connection and then closes it, so
/// that [`StoppableServer::stop`] leaves nothing open: afterwards its address refuses
/// connections, as a server gone offline does. (A [`StaticServer`] keeps the browser's idle
/// keep-alive connections, which go on accepting requests that nobody answers after drop.)
pub struct StoppableServer {
    /// The base URL, ending in `/`.
    pub url: String,
    /// Every path requested so far, without query.
    pub requests: Arc<std::sync::Mutex<Vec<String>>>,
    stop: Arc<std::sync::atomic::AtomicBool>,
    thread: Option<std::thread::JoinHandle<()>>,
}

/// How often the stoppable server's accept loop looks at its stop flag.
const ACCEPT_POLL: Duration = Duration::from_millis(10);
/// Longest wait for a request's head on an accepted connection (a speculative
/// pre-connection may never send one).
const REQUEST_HEAD_TIMEOUT: Duration = Duration::from_secs(10);
/// Largest request head read; the browser's are a few hundred bytes.
const MAX_REQUEST_HEAD: usize = 64 * 1024;

impl StoppableServer {
    /// Serves `root` on a free loopback port.
    pub fn start(root: &Path) -> StoppableServer {
        let listener = TcpListener::bind("127.0.0.1:0").expect("bind stoppable server");
        listener
            .set_nonblocking(true)
            .expect("non-blocking listener");
        let port = listener.local_addr().expect("local address").port();
        let requests = Arc::new(std::sync::Mutex::new(Vec::new()));
        let stop = Arc::new(std::sync::atomic::AtomicBool::new(false));
        let (root, log, halt) = (root.to_path_buf(), requests.clone(), stop.clone());
        let thread = std::thread::spawn(move || {
            while !halt.load(std::sync::atomic::Ordering::SeqCst) {
                match listener.accept() {
                    Ok((stream, _)) => {
                        let (root, log) = (root.clone(), log.clone());
                        std::thread::spawn(move || serve_one(stream, &root, &log));
                    }
                    Err(_) => std::thread::sleep(ACCEPT_POLL),
                }
            }
            // The listener is dropped here: from now on the port refuses connections.
        });
        StoppableServer {
            url: format!("http://127.0.0.1:{port}/"),
            requests,
            stop,
            thread: Some(thread),
        }
    }

    /// Stops listening; returns once the address refuses connections.
    pub fn stop(&mut self) {
        self.stop.store(true, std::sync::atomic::Ordering::SeqCst);
        if let Some(t) = self.thread.take() {
            let _ = t.join();
        }
    }
}

impl Drop for StoppableServer {
    fn drop(&mut self) {
        self.stop();
    }
}

/// Answers the one request on `stream` with a file of `root` (or 404) and closes it.
fn serve_one(mut stream: std::net::TcpStream, root: &Path, log: &std::sync::Mutex<Vec<String>>) {
    use std::io::{Read, Write};
    let _ = stream.set_nonblocking(false);
    let _ = stream.set_read_timeout(Some(REQUEST_HEAD_TIMEOUT));
    let mut head = Vec::new();
    let mut buf = [0u8; 4096];
    while !head.windows(4).any(|w| w == b"\r\n\r\n") && head.len() < MAX_REQUEST_HEAD {
        match stream.read(&mut buf) {
            Ok(0) | Err(_) => return,
            Ok(n) => head.extend_from_slice(&buf[..n]),
        }
    }
    let head = String::from_utf8_lossy(&head);
    let mut words = head.lines().next().unwrap_or("").split_whitespace();
    let (method, target) = (words.next().unwrap_or(""), words.next().unwrap_or("/"));
    let raw = static_files::request_path(target).to_string();
    log.lock().expect("request log").push(raw.clone());
    let file = static_files::file_for(root, &raw);
    let (status, mime, body) = match file.as_ref().map(|f| (std::fs::read(f), f)) {
        Some((Ok(bytes), f)) if method == "GET" => ("200 OK", static_files::media_type(f), bytes),
        _ => ("404 Not Found", "text/plain", b"not found".to_vec()),
    };
    let header = format!(
        "HTTP/1.1 {status}\r\nContent-Type: {mime}\r\nContent-Length: {}\r\n\
         Cache-Control: no-cache\r\nConnection: close\r\n\r\n",
        body.len()
    );
    let _ = stream.write_all(header.as_bytes());
    let _ = stream.write_all(&body);
    let _ = stream.flush();
    let _ = stream.shutdown(std::net::Shutdown::Both);
}
