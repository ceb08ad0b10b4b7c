/**
 * A browser's User-Agent in the words a person recognises ("Chrome on Android"), for the list of
 * signed-in browsers. Only the common families are named; anything else is "a browser".
 * Client-safe: no server imports.
 */
export function describeUserAgent(userAgent: string): string {
  const browser =
    /\bEdg(?:e|A|iOS)?\//.test(userAgent) ? "Edge"
    : /\bFirefox\/|\bFxiOS\//.test(userAgent) ? "Firefox"
    : /\bOPR\//.test(userAgent) ? "Opera"
    : /\b(?:Headless)?Chrome\/|\bCriOS\//.test(userAgent) ? "Chrome"
    : /\bSafari\//.test(userAgent) ? "Safari"
    : /^(?:node|undici|curl|python|Wget)/i.test(userAgent) ? "A program"
    : "A browser";
  const system =
    /\biPhone|\biPad|\biPod/.test(userAgent) ? "iOS"
    : /\bAndroid\b/.test(userAgent) ? "Android"
    : /\bWindows\b/.test(userAgent) ? "Windows"
    : /\bMac OS X\b|\bMacintosh\b/.test(userAgent) ? "macOS"
    : /\bCrOS\b/.test(userAgent) ? "ChromeOS"
    : /\bLinux\b/.test(userAgent) ? "Linux"
    : null;
  return system ? `${browser} on ${system}` : browser;
}
