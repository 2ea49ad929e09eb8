//! The learned window in the last flash page, written through the nRF51's non-volatile memory
//! controller (NVMC): erase the page, write its words, read them back at boot. `memory.x` keeps
//! the page out of the image (build.rs).
use kickguard::diagnosis::learn::LearnedWindow;
use nrf51_pac::NVMC;

/// The page: the last of the nRF51822's 256 pages of 1 KiB.
const PAGE: usize = 0x0003_FC00;
/// Bytes kept: the learned window's nine, padded to whole words.
const BYTES: usize = 12;
/// Polls of READY before a flash operation is given up (an erase takes about 22 ms on the part,
/// at most a few hundred thousand polls at 16 MHz).
const MAX_POLLS: u32 = 4_000_000;

/// The stored bytes (an erased page reads 0xFF: `LearnedWindow::from_bytes` refuses it).
pub fn load() -> [u8; 9] {
    let mut b = [0u8; BYTES];
    for (k, chunk) in b.chunks_exact_mut(4).enumerate() {
        // SAFETY: PAGE + 4k (k < 3) is a word-aligned address inside the part's flash, which is
        // always readable; the linker places nothing there (memory.x ends the image below it).
        let w = unsafe { core::ptr::read_volatile((PAGE + 4 * k) as *const u32) };
        chunk.copy_from_slice(&w.to_le_bytes());
    }
    let mut out = [0u8; 9];
    out.copy_from_slice(&b[..9]);
    out
}

/// Erases the page and writes `w` to it; false if the controller never became ready.
pub fn save(nvmc: &NVMC, w: &LearnedWindow) -> bool {
    let mut b = [0xFFu8; BYTES];
    b[..9].copy_from_slice(&w.to_bytes());
    if !ready(nvmc) {
        return false;
    }
    nvmc.config.write(|c| c.wen().een());
    // SAFETY: ERASEPAGE takes the address of a page; PAGE is the last page of the part's flash
    // and holds no code or data of the image (memory.x).
    nvmc.erasepage().write(|e| unsafe { e.bits(PAGE as u32) });
    let mut ok = ready(nvmc);
    nvmc.config.write(|c| c.wen().wen());
    for (k, chunk) in b.chunks_exact(4).enumerate() {
        let word = u32::from_le_bytes([chunk[0], chunk[1], chunk[2], chunk[3]]);
        // SAFETY: writes are enabled (CONFIG.WEN), the address is a word of the erased page
        // above, and the controller was ready.
        unsafe { core::ptr::write_volatile((PAGE + 4 * k) as *mut u32, word) };
        ok &= ready(nvmc);
    }
    nvmc.config.write(|c| c.wen().ren());
    ok
}

/// Waits for the controller, at most MAX_POLLS polls.
fn ready(nvmc: &NVMC) -> bool {
    (0..MAX_POLLS).any(|_| nvmc.ready.read().ready().is_ready())
}
