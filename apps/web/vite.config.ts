import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';

/** Where `npm run dev` forwards API and Socket.IO traffic (the API's default port). */
const apiTarget = process.env.PHASELOOP_API_URL ?? 'http://127.0.0.1:4100';

export default defineConfig({
  plugins: [vue()],
  resolve: {
    alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) },
  },
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/socket.io': { target: apiTarget, ws: true, changeOrigin: false },
    },
  },
  preview: { host: '127.0.0.1', port: 4173 },
  build: {
    target: 'es2022',
    // The three big libraries get chunks of their own, so the shell loads without the 3D viewer
    // or the plotting code, and a change in app code does not bust the vendors' cache.
    chunkSizeWarningLimit: 1200,
    rolldownOptions: {
      output: {
        codeSplitting: {
          groups: [
            // Highest priority: otherwise a library group takes the Vue runtime in as its dependency.
            { name: 'vue', test: /node_modules[\\/](vue|@vue|vue-router|pinia)[\\/]/, priority: 40 },
            { name: 'three', test: /node_modules[\\/]three[\\/]/, priority: 30 },
            { name: 'echarts', test: /node_modules[\\/](echarts|zrender|vue-echarts)[\\/]/, priority: 30 },
            { name: 'element-plus', test: /node_modules[\\/](element-plus|@element-plus|@floating-ui|@popperjs|async-validator|dayjs|lodash-es|lodash-unified|@vueuse|normalize-wheel-es|memoize-one)[\\/]/, priority: 20 },
          ],
        },
      },
    },
  },
});
