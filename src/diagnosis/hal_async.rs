//! Timing the flyback from an async task (feature `async`): switch the coil off, then await
//! the comparator's edge with `embedded-hal-async`'s [`Wait`], raced against an async delay
//! that bounds it. The ticks come from the same free-running [`TickCounter`] as the blocking
//! routines of [`super::hal`], so the reading is the same whichever way the firmware waits.
//!
//! Work: the task sleeps until the pin's edge or the delay wakes it; each wake polls two
//! futures (constant work). The wait ends when the comparator falls or when the delay elapses,
//! whichever comes first: the delay bounds it whatever the pin does. Not yet in the link-time
//! panic proof (the blocking routines are).

use super::hal::{MeasureError, TickCounter};
use core::future::Future;
use core::pin::pin;
use core::task::Poll;
use embedded_hal::digital::OutputPin;
use embedded_hal_async::delay::DelayNs;
use embedded_hal_async::digital::Wait;

/// Which of two raced futures finished first, with its output.
enum First<A, B> {
    /// The first.
    A(A),
    /// The second.
    B(B),
}

/// Polls both futures until one is ready; the first one wins a tie.
async fn first<A: Future, B: Future>(a: A, b: B) -> First<A::Output, B::Output> {
    let mut a = pin!(a);
    let mut b = pin!(b);
    core::future::poll_fn(|cx| {
        if let Poll::Ready(x) = a.as_mut().poll(cx) {
            return Poll::Ready(First::A(x));
        }
        if let Poll::Ready(x) = b.as_mut().poll(cx) {
            return Poll::Ready(First::B(x));
        }
        Poll::Pending
    })
    .await
}

/// Switches the coil off (drive low) and returns the ticks until the drain comparator `sense`
/// falls, read from `counter`, awaiting the edge; at most `timeout_us` microseconds of
/// `delay`. A sense input already low returns about 0.
///
/// # Errors
/// [`MeasureError::Output`] / [`MeasureError::Input`] with the pin's own error;
/// [`MeasureError::Timeout`] when the delay elapses first (the flyback never ended).
///
/// ```
/// # // A stub executor and pins, to show the call; a firmware uses its own.
/// # use core::convert::Infallible;
/// # use kickguard::diagnosis::hal::TickCounter;
/// # struct Pin; struct Counter(u32); struct Delay;
/// # impl embedded_hal::digital::ErrorType for Pin { type Error = Infallible; }
/// # impl embedded_hal::digital::OutputPin for Pin {
/// #   fn set_low(&mut self) -> Result<(), Infallible> { Ok(()) }
/// #   fn set_high(&mut self) -> Result<(), Infallible> { Ok(()) } }
/// # impl embedded_hal_async::digital::Wait for Pin {
/// #   async fn wait_for_high(&mut self) -> Result<(), Infallible> { Ok(()) }
/// #   async fn wait_for_low(&mut self) -> Result<(), Infallible> { Ok(()) }
/// #   async fn wait_for_rising_edge(&mut self) -> Result<(), Infallible> { Ok(()) }
/// #   async fn wait_for_falling_edge(&mut self) -> Result<(), Infallible> { Ok(()) }
/// #   async fn wait_for_any_edge(&mut self) -> Result<(), Infallible> { Ok(()) } }
/// # impl TickCounter for Counter { fn ticks(&mut self) -> u32 { self.0 += 7; self.0 } }
/// # impl embedded_hal_async::delay::DelayNs for Delay { async fn delay_ns(&mut self, _: u32) { core::future::pending::<()>().await } }
/// # fn block_on<F: core::future::Future>(f: F) -> F::Output {
/// #   let mut f = core::pin::pin!(f); let w = core::task::Waker::noop();
/// #   let mut cx = core::task::Context::from_waker(&w);
/// #   loop { if let core::task::Poll::Ready(x) = f.as_mut().poll(&mut cx) { return x; } } }
/// use kickguard::diagnosis::hal_async::time_flyback;
/// let (mut drive, mut sense) = (Pin, Pin);
/// let ticks = block_on(time_flyback(&mut drive, &mut sense, &mut Counter(0), &mut Delay, 10_000));
/// assert_eq!(ticks, Ok(7));
/// ```
pub async fn time_flyback<O, I, C, D>(
    drive: &mut O,
    sense: &mut I,
    counter: &mut C,
    delay: &mut D,
    timeout_us: u32,
) -> Result<u32, MeasureError<O::Error, I::Error>>
where
    O: OutputPin,
    I: Wait,
    C: TickCounter,
    D: DelayNs,
{
    drive.set_low().map_err(MeasureError::Output)?;
    let start = counter.ticks();
    match first(sense.wait_for_low(), delay.delay_us(timeout_us)).await {
        First::A(Ok(())) => Ok(counter.ticks().wrapping_sub(start)),
        First::A(Err(e)) => Err(MeasureError::Input(e)),
        First::B(()) => Err(MeasureError::Timeout),
    }
}

/// Switches the coil off and returns the ticks from the upper current comparator falling to the
/// lower one falling (the current-sense measurement), awaiting both edges within one
/// `timeout_us` from switch-off.
///
/// # Errors
/// As [`time_flyback`].
pub async fn time_current_window<O, I, C, D>(
    drive: &mut O,
    upper: &mut I,
    lower: &mut I,
    counter: &mut C,
    delay: &mut D,
    timeout_us: u32,
) -> Result<u32, MeasureError<O::Error, I::Error>>
where
    O: OutputPin,
    I: Wait,
    C: TickCounter,
    D: DelayNs,
{
    drive.set_low().map_err(MeasureError::Output)?;
    let both = async {
        upper.wait_for_low().await?;
        let t_up = counter.ticks();
        lower.wait_for_low().await?;
        Ok((t_up, counter.ticks()))
    };
    match first(both, delay.delay_us(timeout_us)).await {
        First::A(Ok((up, lo))) => Ok(lo.wrapping_sub(up)),
        First::A(Err(e)) => Err(MeasureError::Input(e)),
        First::B(()) => Err(MeasureError::Timeout),
    }
}
