// Package headless starts a headless Chromium for the browser tests and
// records what the pages do in it: messages on the console, uncaught
// exceptions and every request a page makes, so that a test can check
// that a page ran without errors and asked nothing of other machines.
//
// Browser skips the calling test, saying why, where no Chromium is
// installed (scripts/install-chromium.sh installs Debian's). The browser
// runs with a fresh profile and without the background services that
// would try to reach the internet.
package headless
