/**
 * Text an attacker could put in a shared state file, one payload per way out of a text
 * context (OWASP XSS Filter Evasion Cheat Sheet, categories; the payloads are our own). Each
 * sets window.__pwned if it ever runs, so a browser test can tell.
 */
export const HOSTILE_PAYLOADS: readonly string[] = [
  `</script><script>window.__pwned="script"</script>`,
  `<img src=x onerror="window.__pwned='img'">`,
  `javascript:window.__pwned='url'`,
  `<svg><foreignObject><body onload="window.__pwned='fo'"><p>x</p></body></foreignObject></svg>`,
  `</style><script>window.__pwned='style'</script><style>`,
  `<a href="javascript:window.__pwned='link'">link</a>`,
  `--><!-- ]]><![CDATA[ "quoted" 'single' & \u2028\u2029 <b>bold</b>`,
];
