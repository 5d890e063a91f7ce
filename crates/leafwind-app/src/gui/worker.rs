//! Background jobs that never block the frame.
//!
//! A [`Job`] runs one computation at a time on its own thread. While it runs, newer inputs wait as
//! "pending" (only the newest is kept); when the result arrives the pending input starts, the UI
//! asks egui for a repaint, and the last valid result stays on screen meanwhile. Tests may run jobs
//! inline (on the calling thread) so that results are ready in the same frame.

use std::sync::mpsc::{Receiver, Sender, channel};
use std::time::{Duration, Instant};

/// A computation from `I` to a result `O` (or an error in words).
pub type JobFn<I, O> = fn(&I) -> Result<O, String>;

/// One kind of background computation (sweep, map, boundary layer).
pub struct Job<I, O> {
    run: JobFn<I, O>,
    inline: bool,
    tx: Sender<(I, Result<O, String>, Duration)>,
    rx: Receiver<(I, Result<O, String>, Duration)>,
    /// The input being computed now.
    running: Option<I>,
    /// The newest input waiting for the running one to finish.
    pending: Option<I>,
    /// The last input submitted (to tell whether the inputs changed).
    last_submitted: Option<I>,
    /// The last valid result and the input it belongs to.
    result: Option<(I, O)>,
    /// The error of the newest finished run, if it failed.
    error: Option<String>,
    /// How long the last run took.
    last_duration: Option<Duration>,
}

impl<I, O> Job<I, O>
where
    I: Clone + PartialEq + Send + 'static,
    O: Send + 'static,
{
    /// A job running `run`; `inline` runs it on the calling thread.
    #[must_use]
    pub fn new(run: JobFn<I, O>, inline: bool) -> Self {
        let (tx, rx) = channel();
        Self {
            run,
            inline,
            tx,
            rx,
            running: None,
            pending: None,
            last_submitted: None,
            result: None,
            error: None,
            last_duration: None,
        }
    }

    /// Asks for a result for `input` unless it is the one last asked for.
    pub fn submit(&mut self, input: I, ctx: &egui::Context) {
        if self.last_submitted.as_ref() == Some(&input) {
            return;
        }
        self.last_submitted = Some(input.clone());
        if self.running.is_some() {
            self.pending = Some(input);
        } else {
            self.start(input, ctx);
        }
    }

    fn start(&mut self, input: I, ctx: &egui::Context) {
        if self.inline {
            let t0 = Instant::now();
            let out = (self.run)(&input);
            self.finish(input, out, t0.elapsed());
            return;
        }
        self.running = Some(input.clone());
        let tx = self.tx.clone();
        let run = self.run;
        let ctx = ctx.clone();
        let spawned = std::thread::Builder::new()
            .name("leafwind-job".to_owned())
            .spawn(move || {
                let t0 = Instant::now();
                let out = run(&input);
                // The receiver lives as long as the app; a send error only means it closed.
                let _ = tx.send((input, out, t0.elapsed()));
                ctx.request_repaint();
            });
        if spawned.is_err() {
            // No thread available: compute here rather than never.
            if let Some(input) = self.running.take() {
                let t0 = Instant::now();
                let out = (self.run)(&input);
                self.finish(input, out, t0.elapsed());
            }
        }
    }

    fn finish(&mut self, input: I, out: Result<O, String>, took: Duration) {
        self.last_duration = Some(took);
        match out {
            Ok(o) => {
                self.result = Some((input, o));
                self.error = None;
            }
            Err(e) => self.error = Some(e),
        }
    }

    /// Collects a finished result and starts the pending input. Call once per frame.
    pub fn poll(&mut self, ctx: &egui::Context) {
        while let Ok((input, out, took)) = self.rx.try_recv() {
            self.running = None;
            self.finish(input, out, took);
        }
        if self.running.is_none()
            && let Some(next) = self.pending.take()
        {
            self.start(next, ctx);
        }
    }

    /// The last valid result.
    #[must_use]
    pub fn result(&self) -> Option<&O> {
        self.result.as_ref().map(|(_, o)| o)
    }

    /// Whether the result shown is for older inputs than the last submitted (or none yet).
    #[must_use]
    pub fn is_busy(&self) -> bool {
        self.running.is_some() || self.pending.is_some()
    }

    /// Whether the shown result belongs to the newest inputs.
    #[must_use]
    pub fn is_current(&self) -> bool {
        match (&self.result, &self.last_submitted) {
            (Some((i, _)), Some(last)) => i == last && !self.is_busy(),
            _ => false,
        }
    }

    /// The error of the newest run, if it failed.
    #[must_use]
    pub fn error(&self) -> Option<&str> {
        self.error.as_deref()
    }

    /// How long the last run took.
    #[must_use]
    pub fn last_duration(&self) -> Option<Duration> {
        self.last_duration
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn square(x: &f64) -> Result<f64, String> {
        if x.is_finite() {
            Ok(x * x)
        } else {
            Err("not finite".to_owned())
        }
    }

    #[test]
    fn threaded_job_delivers_and_keeps_last_valid() {
        let ctx = egui::Context::default();
        let mut job = Job::new(square, false);
        job.submit(3.0, &ctx);
        let t0 = Instant::now();
        while job.is_busy() && t0.elapsed() < Duration::from_secs(5) {
            job.poll(&ctx);
            std::thread::sleep(Duration::from_millis(1));
        }
        assert_eq!(job.result(), Some(&9.0));
        assert!(job.is_current());
        job.submit(f64::NAN, &ctx);
        while job.is_busy() && t0.elapsed() < Duration::from_secs(5) {
            job.poll(&ctx);
            std::thread::sleep(Duration::from_millis(1));
        }
        assert_eq!(job.result(), Some(&9.0));
        assert!(job.error().is_some());
    }

    fn slow(x: &u64) -> Result<u64, String> {
        std::thread::sleep(Duration::from_millis(*x));
        Ok(*x)
    }

    #[test]
    fn a_slow_job_does_not_block_and_only_the_newest_pending_runs() {
        let ctx = egui::Context::default();
        let mut job = Job::new(slow, false);
        let t0 = Instant::now();
        job.submit(300, &ctx);
        job.submit(301, &ctx);
        job.submit(302, &ctx);
        job.poll(&ctx);
        // Submitting and polling return at once (well under the 300 ms the job sleeps).
        assert!(t0.elapsed() < Duration::from_millis(150));
        assert!(job.is_busy() && job.result().is_none());
        while job.is_busy() && t0.elapsed() < Duration::from_secs(10) {
            job.poll(&ctx);
            std::thread::sleep(Duration::from_millis(5));
        }
        // 300 ran, 301 was replaced by 302 while waiting.
        assert_eq!(job.result(), Some(&302));
        assert!(job.is_current());
    }

    #[test]
    fn inline_job_is_ready_at_once() {
        let ctx = egui::Context::default();
        let mut job = Job::new(square, true);
        job.submit(2.0, &ctx);
        assert_eq!(job.result(), Some(&4.0));
    }
}
