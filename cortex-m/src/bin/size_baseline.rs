//! Size baseline: the runtime (vector table, reset handler, semihosting exit) with no kickguard
//! code. `.ci/cross` subtracts its size from `size_runtime`'s to get the run-time API's flash.
#![no_std]
#![no_main]

use cortex_m_rt::entry;

#[entry]
fn main() -> ! {
    cortex_m_semihosting::debug::exit(cortex_m_semihosting::debug::EXIT_SUCCESS);
    loop {}
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    loop {}
}
