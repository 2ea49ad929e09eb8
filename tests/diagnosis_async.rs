//! The async flyback timing (feature `async`) with mock pins, a mock delay and a minimal
//! executor: the comparator's edge ends it with the ticks between switch-off and the edge; a
//! comparator stuck high ends at the delay; the pins' own errors are carried. The expected
//! tick counts follow from the mock counter (one step per read: arithmetic).

use core::convert::Infallible;
use core::future::Future;
use core::pin::pin;
use core::task::{Context, Poll, Waker};
use kickguard::diagnosis::hal::{MeasureError, TickCounter};
use kickguard::diagnosis::hal_async::{time_current_window, time_flyback};

/// Polls `f` until it is ready (at most 10 000 polls: a test that hangs fails instead).
fn block_on<F: Future>(f: F) -> F::Output {
    let mut f = pin!(f);
    let mut cx = Context::from_waker(Waker::noop());
    for _ in 0..10_000 {
        if let Poll::Ready(x) = f.as_mut().poll(&mut cx) {
            return x;
        }
    }
    panic!("the future did not finish");
}

/// A future ready after `n` polls.
struct After(u32);
impl Future for After {
    type Output = ();
    fn poll(mut self: core::pin::Pin<&mut Self>, cx: &mut Context<'_>) -> Poll<()> {
        if self.0 == 0 {
            Poll::Ready(())
        } else {
            self.0 -= 1;
            cx.waker().wake_by_ref();
            Poll::Pending
        }
    }
}

/// A comparator that falls after `polls` polls of its wait (never, for u32::MAX), or fails.
struct Comparator {
    polls: u32,
    fails: bool,
}
#[derive(Debug, PartialEq)]
struct PinFault;
impl embedded_hal::digital::Error for PinFault {
    fn kind(&self) -> embedded_hal::digital::ErrorKind {
        embedded_hal::digital::ErrorKind::Other
    }
}
impl embedded_hal::digital::ErrorType for Comparator {
    type Error = PinFault;
}
impl embedded_hal_async::digital::Wait for Comparator {
    async fn wait_for_high(&mut self) -> Result<(), PinFault> {
        Ok(())
    }
    async fn wait_for_low(&mut self) -> Result<(), PinFault> {
        if self.fails {
            return Err(PinFault);
        }
        After(self.polls).await;
        Ok(())
    }
    async fn wait_for_rising_edge(&mut self) -> Result<(), PinFault> {
        Ok(())
    }
    async fn wait_for_falling_edge(&mut self) -> Result<(), PinFault> {
        self.wait_for_low().await
    }
    async fn wait_for_any_edge(&mut self) -> Result<(), PinFault> {
        Ok(())
    }
}

/// The coil's drive.
struct Drive;
impl embedded_hal::digital::ErrorType for Drive {
    type Error = Infallible;
}
impl embedded_hal::digital::OutputPin for Drive {
    fn set_low(&mut self) -> Result<(), Infallible> {
        Ok(())
    }
    fn set_high(&mut self) -> Result<(), Infallible> {
        Ok(())
    }
}

/// A counter that advances `step` ticks at every read.
struct Counter {
    now: u32,
    step: u32,
}
impl TickCounter for Counter {
    fn ticks(&mut self) -> u32 {
        self.now = self.now.wrapping_add(self.step);
        self.now
    }
}

/// A delay that elapses after `polls` polls whatever it is asked for.
struct Delay {
    polls: u32,
}
impl embedded_hal_async::delay::DelayNs for Delay {
    async fn delay_ns(&mut self, _ns: u32) {
        After(self.polls).await;
    }
}

#[test]
fn the_edge_ends_the_wait_with_the_ticks_since_switch_off() {
    // Two counter reads (switch-off, edge) 25 ticks apart, across the counter's wrap.
    let mut c = Counter {
        now: u32::MAX - 30,
        step: 25,
    };
    let mut sense = Comparator {
        polls: 3,
        fails: false,
    };
    let r = block_on(time_flyback(
        &mut Drive,
        &mut sense,
        &mut c,
        &mut Delay { polls: 100 },
        5_000,
    ));
    assert_eq!(r, Ok(25));
}

#[test]
fn a_comparator_stuck_high_ends_at_the_delay() {
    let mut sense = Comparator {
        polls: u32::MAX,
        fails: false,
    };
    let r = block_on(time_flyback(
        &mut Drive,
        &mut sense,
        &mut Counter { now: 0, step: 1 },
        &mut Delay { polls: 50 },
        5_000,
    ));
    assert_eq!(r, Err(MeasureError::Timeout));
}

#[test]
fn the_pins_error_is_carried() {
    let mut sense = Comparator {
        polls: 0,
        fails: true,
    };
    let r = block_on(time_flyback(
        &mut Drive,
        &mut sense,
        &mut Counter { now: 0, step: 1 },
        &mut Delay { polls: 50 },
        5_000,
    ));
    assert_eq!(r, Err(MeasureError::Input(PinFault)));
}

#[test]
fn the_current_window_is_timed_between_its_two_edges() {
    // Reads: upper edge, lower edge, 10 ticks apart.
    let mut upper = Comparator {
        polls: 2,
        fails: false,
    };
    let mut lower = Comparator {
        polls: 4,
        fails: false,
    };
    let r = block_on(time_current_window(
        &mut Drive,
        &mut upper,
        &mut lower,
        &mut Counter { now: 0, step: 10 },
        &mut Delay { polls: 100 },
        5_000,
    ));
    assert_eq!(r, Ok(10));
    // A lower comparator that never falls: the delay ends it.
    let mut upper = Comparator {
        polls: 1,
        fails: false,
    };
    let mut lower = Comparator {
        polls: u32::MAX,
        fails: false,
    };
    let r = block_on(time_current_window(
        &mut Drive,
        &mut upper,
        &mut lower,
        &mut Counter { now: 0, step: 10 },
        &mut Delay { polls: 20 },
        5_000,
    ));
    assert_eq!(r, Err(MeasureError::Timeout));
}
