/*
 * Kinespec's mark: a wave (a spectrum's line) over a dark square, as the console's top bar draws it. One home
 * for the favicon of the console and of the API documentation, served at /favicon.svg.
 */
export const BRAND_NAME = 'Kinespec';

export const BRAND_MARK_SVG = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 32 32" width="32" height="32">
<rect width="32" height="32" rx="6" fill="#1c2530"/>
<path d="M4 17c3-9 6-9 8 0s5 9 8 0 5-9 8 0" fill="none" stroke="#56b4e9" stroke-width="3" stroke-linecap="round"/>
</svg>
`;

/** A wider mark with the name, for the top bar of the API documentation. */
export const BRAND_LOGO_SVG = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 190 32" width="190" height="32">
<rect width="32" height="32" rx="6" fill="#1c2530"/>
<path d="M4 17c3-9 6-9 8 0s5 9 8 0 5-9 8 0" fill="none" stroke="#56b4e9" stroke-width="3" stroke-linecap="round"/>
<text x="40" y="23" font-family="system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif" font-size="19" font-weight="700" fill="#ffffff">Kinespec API</text>
</svg>
`;
