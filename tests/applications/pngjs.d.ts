// pngjs ships no types; the tests use only this much of it.
declare module "pngjs" {
  export class PNG {
    constructor(options: { width: number; height: number });
    width: number;
    height: number;
    data: Buffer;
    static sync: { write(png: PNG): Buffer; read(buffer: Buffer): PNG };
  }
}
