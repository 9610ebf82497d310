// Apply the saved theme before the first paint so a dark room never sees a white flash.
// A file, not an inline script, so the page's Content-Security-Policy can forbid inline scripts.
document.documentElement.dataset.theme = localStorage.getItem('ew.theme') || 'night';
