/** Module declarations for Vite asset imports used by the app (tsc does not load vite/client). */
declare module '*?url' {
  const url: string;
  export default url;
}
declare module '*?raw' {
  const text: string;
  export default text;
}
declare module '*.css' {
  const css: string;
  export default css;
}
