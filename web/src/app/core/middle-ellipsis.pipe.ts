/**
 * `{{ name | middleEllipsis: 32 }}`: a long map, scenario or set name cut in the middle (its
 * distinguishing end kept) for selects and lists; put the full name in the element's `title`.
 */
import { Pipe, type PipeTransform } from '@angular/core';
import { middleEllipsis } from './middle-ellipsis';

/** Characters a name keeps in a select option when nothing else is said. */
export const OPTION_NAME_CHARS = 36;

@Pipe({ name: 'middleEllipsis' })
export class MiddleEllipsisPipe implements PipeTransform {
  transform(name: string | null | undefined, maxChars = OPTION_NAME_CHARS): string {
    return name == null ? '' : middleEllipsis(name, maxChars);
  }
}
