// OpsLvp idle sign-out (issue 13): a page that carries [data-idle-signout-seconds] (the tablet's actions page) signs
// its person out after that many seconds without a touch, click or key, by submitting the header's sign-out form
// (a real POST with its antiforgery token), so a shared tablet never ticks under the previous person's name. The
// last 30 s are announced on the page. The idle time is the aerodrome profile's tabletIdleSignOutMinutes.
(function () {
    const warnSeconds = 30;
    let lastActivity = performance.now();
    let submitted = false;

    function touched() {
        lastActivity = performance.now();
        const warning = document.querySelector("[data-idle-warning]");
        if (warning !== null) {
            warning.hidden = true;
        }
    }

    ["pointerdown", "keydown", "touchstart", "wheel", "scroll"].forEach(name =>
        window.addEventListener(name, touched, { capture: true, passive: true }));

    function check() {
        const marker = document.querySelector("[data-idle-signout-seconds]");
        if (marker === null || submitted) {
            lastActivity = marker === null ? performance.now() : lastActivity;
            return;
        }
        const limit = Number(marker.getAttribute("data-idle-signout-seconds"));
        if (!(limit > 0)) {
            return;
        }
        const idle = (performance.now() - lastActivity) / 1000;
        const warning = document.querySelector("[data-idle-warning]");
        if (warning !== null) {
            const left = Math.ceil(limit - idle);
            warning.hidden = left > warnSeconds;
            const count = warning.querySelector("[data-idle-left]");
            if (count !== null) {
                count.textContent = String(Math.max(0, left));
            }
        }
        if (idle >= limit) {
            const form = document.querySelector("form[data-idle-signout]");
            if (form !== null) {
                submitted = true;
                form.submit();
            }
        }
    }

    setInterval(check, 500);
})();
