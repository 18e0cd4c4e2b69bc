// OpsLvp live watch (issue 13): every interactive page carries #opslvp-heartbeat, which the server re-renders once
// per heartbeat interval (Components/Shell/LiveHeartbeat). This script, loaded by every page, notes when the beat
// last changed by the browser's own monotonic clock; after two intervals without a beat it marks the document
// "opslvp-nolive" (CSS shows the full-width banner and greys the values) and writes the server time of the last
// beat it saw into the banner. A stalled network is caught as well as a closed connection: nothing arriving is
// what counts. When beats resume the banner goes away by itself.
(function () {
    const checkEveryMs = 250;
    let lastBeat = null;
    let lastChange = 0;
    let lastServerTime = "";
    let stale = false;

    function setStale(on) {
        if (on === stale) {
            return;
        }
        stale = on;
        if (on) {
            document.querySelectorAll(".opslvp-nolive-since").forEach(e => { e.textContent = lastServerTime; });
        }
        document.documentElement.classList.toggle("opslvp-nolive", on);
    }

    function check() {
        const beat = document.getElementById("opslvp-heartbeat");
        if (beat === null || beat.dataset.watch !== "on") {
            lastBeat = null;
            setStale(false);
            return;
        }
        const now = performance.now();
        if (beat.dataset.beat !== lastBeat) {
            lastBeat = beat.dataset.beat;
            lastChange = now;
            lastServerTime = beat.dataset.serverTime || "";
            setStale(false);
            return;
        }
        const interval = Number(beat.dataset.intervalMs) || 2000;
        if (now - lastChange > 2 * interval) {
            setStale(true);
        }
    }

    setInterval(check, checkEveryMs);
})();
