// `app.use(ElementPlus)` registers v-loading globally; element-plus/global types only components.
import type { vLoading } from 'element-plus';

declare module 'vue' {
  interface GlobalDirectives {
    vLoading: typeof vLoading;
  }
}

export {};
