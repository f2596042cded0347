/** swagger-ui-dist ships bundles without type declarations; the page uses only the constructor and these options. */
declare module 'swagger-ui-dist/swagger-ui-es-bundle.js' {
  /** Options of SwaggerUI(...) that /help/api sets (see the package's documented configuration). */
  interface SwaggerUiOptions {
    readonly domNode: HTMLElement;
    readonly url: string;
    readonly validatorUrl: string | null;
    readonly supportedSubmitMethods: readonly string[];
    readonly deepLinking: boolean;
    readonly docExpansion: 'list' | 'full' | 'none';
    readonly defaultModelsExpandDepth: number;
    readonly defaultModelExpandDepth: number;
    readonly displayRequestDuration: boolean;
    readonly filter: boolean;
    readonly showExtensions: boolean;
    readonly onComplete?: () => void;
  }
  const SwaggerUI: (options: SwaggerUiOptions) => unknown;
  export default SwaggerUI;
}
