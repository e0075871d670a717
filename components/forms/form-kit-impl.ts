// What the app's forms use of react-hook-form and its zod resolver, in one module that only
// form-kit.tsx imports, with import(): the forms' library is then one chunk of its own instead of
// riding in __common, which every first screen loads (the landing page too, which has no such form).
export { Controller, useFieldArray, useForm, useWatch } from 'react-hook-form';
export { zodResolver } from '@hookform/resolvers/zod';
