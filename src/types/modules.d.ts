// Packages that ship no type declarations of their own.
declare module 'wink-eng-lite-web-model' {
  const model: any;
  export default model;
}
declare module 'stopword' {
  export const eng: string[];
  export function removeStopwords(tokens: string[], stopwords?: string[]): string[];
}
