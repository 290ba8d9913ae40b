import { useNavigate } from 'react-router-dom';
import { ChangePasswordForm } from '../../features/auth/components/change-password-form';
import { endSession } from '../session';

export function ChangePasswordRoute() {
  const navigate = useNavigate();
  return (
    <div className="mx-auto max-w-md rounded-lg border border-line bg-panel p-6">
      <h1 className="mb-4 text-2xl font-bold">Change password</h1>
      <ChangePasswordForm onChanged={() => void endSession('password-changed')} onCancel={() => navigate(-1)} />
    </div>
  );
}
