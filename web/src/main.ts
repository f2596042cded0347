/** Browser entry point: boots the Quarterturn shell. */
import { bootstrapApplication } from '@angular/platform-browser';
import { appConfig } from './app/app-config';
import Shell from './app/core/shell';

bootstrapApplication(Shell, appConfig).catch((err: unknown) => console.error(err));
