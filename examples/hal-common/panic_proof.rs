// Shared by the HAL examples (`include!`d): the link-time panic proof. The handler calls a
// symbol that does not exist, so the release (LTO) link fails with "undefined symbol:
// __PANIC_PATH_IS_REACHABLE__see_linker_error" if any panic path of the firmware (its HAL
// included) is reachable.
#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    extern "Rust" {
        #[link_name = "__PANIC_PATH_IS_REACHABLE__see_linker_error"]
        fn panic_is_reachable() -> !;
    }
    // SAFETY: the symbol does not exist; this call exists only to make the link fail.
    unsafe { panic_is_reachable() }
}
